// Weighted mean with Birge-ratio scaling over several sweeps and approach-retract hysteresis; see
// fit_summary.hpp for the formulas and their source.
#include "tipgap/fit/fit_summary.hpp"

#include <boost/math/distributions/normal.hpp>
#include <cmath>
#include <fmt/format.h>
#include <limits>

#include "tipgap/core/constants.hpp"

namespace tipgap {

namespace {
constexpr double nan = std::numeric_limits<double>::quiet_NaN();
}

weighted_mean combine_weighted(std::span<const double> values, std::span<const double> stderrs) {
    weighted_mean out;
    double sw = 0.0, swx = 0.0, sx = 0.0, sxx = 0.0;
    for (std::size_t k = 0; k < values.size(); ++k) {
        const double x = values[k], s = stderrs[k];
        if (!std::isfinite(x) || !(s > 0.0) || !std::isfinite(s)) continue;
        const double w = 1.0 / (s * s);
        sw += w;
        swx += w * x;
        sx += x;
        sxx += x * x;
        ++out.count;
    }
    if (out.count == 0) {
        out.mean = out.standard_error = out.birge_ratio = out.spread = nan;
        return out;
    }
    out.mean = swx / sw;
    out.standard_error = 1.0 / std::sqrt(sw);
    const auto n = static_cast<double>(out.count);
    if (out.count < 2) {
        out.birge_ratio = out.spread = nan;
        return out;
    }
    double chi2 = 0.0;
    for (std::size_t k = 0; k < values.size(); ++k) {
        const double x = values[k], s = stderrs[k];
        if (!std::isfinite(x) || !(s > 0.0) || !std::isfinite(s)) continue;
        chi2 += (x - out.mean) * (x - out.mean) / (s * s);
    }
    out.birge_ratio = std::sqrt(chi2 / (n - 1.0));
    if (out.birge_ratio > 1.0) out.standard_error *= out.birge_ratio;
    out.spread = std::sqrt(std::max(0.0, (sxx - sx * sx / n) / (n - 1.0)));
    return out;
}

fit_summary summarise_fits(std::span<const fit_result> fits) {
    std::vector<double> k, ks, p, ps, ka, kas, kr, krs;
    for (const fit_result& f : fits) {
        k.push_back(f.decay_constant_per_m);
        ks.push_back(f.decay_constant_stderr_per_m);
        p.push_back(f.apparent_barrier_J);
        ps.push_back(f.apparent_barrier_stderr_J);
        if (f.direction == sweep_direction::approach) {
            ka.push_back(f.decay_constant_per_m);
            kas.push_back(f.decay_constant_stderr_per_m);
        } else if (f.direction == sweep_direction::retract) {
            kr.push_back(f.decay_constant_per_m);
            krs.push_back(f.decay_constant_stderr_per_m);
        }
    }
    fit_summary s;
    s.decay_constant_per_m = combine_weighted(k, ks);
    s.apparent_barrier_J = combine_weighted(p, ps);
    s.approach_decay_per_m = combine_weighted(ka, kas);
    s.retract_decay_per_m = combine_weighted(kr, krs);
    if (s.approach_decay_per_m.count > 0 && s.retract_decay_per_m.count > 0) {
        s.hysteresis_per_m = s.approach_decay_per_m.mean - s.retract_decay_per_m.mean;
        s.hysteresis_stderr_per_m = std::hypot(s.approach_decay_per_m.standard_error, s.retract_decay_per_m.standard_error);
        const double z = std::abs(s.hysteresis_per_m) / s.hysteresis_stderr_per_m;
        s.hysteresis_p_value = std::isfinite(z) ? 2.0 * boost::math::cdf(boost::math::complement(boost::math::normal(), z)) : nan;
    } else {
        s.hysteresis_per_m = s.hysteresis_stderr_per_m = s.hysteresis_p_value = nan;
    }
    return s;
}

namespace {
constexpr scaling to_per_nm = times(1e-9), to_eV = divided_by(si::electron_volt);
}

const std::vector<column<fit_summary>>& fit_summary_columns() {
    using s = fit_summary;
    static const std::vector<column<s>> columns = {
        {"sweeps", "", [](const s& x) { return x.decay_constant_per_m.count; }},
        {"decay_constant_mean_per_nm", "", [](const s& x) { return x.decay_constant_per_m.mean; }, to_per_nm},
        {"decay_constant_mean_stderr_per_nm", "", [](const s& x) { return x.decay_constant_per_m.standard_error; }, to_per_nm},
        {"decay_constant_spread_per_nm", "", [](const s& x) { return x.decay_constant_per_m.spread; }, to_per_nm},
        {"decay_constant_birge_ratio", "", [](const s& x) { return x.decay_constant_per_m.birge_ratio; }},
        {"apparent_barrier_mean_eV", "", [](const s& x) { return x.apparent_barrier_J.mean; }, to_eV},
        {"apparent_barrier_mean_stderr_eV", "", [](const s& x) { return x.apparent_barrier_J.standard_error; }, to_eV},
        {"apparent_barrier_spread_eV", "", [](const s& x) { return x.apparent_barrier_J.spread; }, to_eV},
        {"apparent_barrier_birge_ratio", "", [](const s& x) { return x.apparent_barrier_J.birge_ratio; }},
        {"approach_sweeps", "", [](const s& x) { return x.approach_decay_per_m.count; }},
        {"retract_sweeps", "", [](const s& x) { return x.retract_decay_per_m.count; }},
        {"approach_minus_retract_per_nm", "", [](const s& x) { return x.hysteresis_per_m; }, to_per_nm},
        {"approach_minus_retract_stderr_per_nm", "", [](const s& x) { return x.hysteresis_stderr_per_m; }, to_per_nm},
        {"approach_minus_retract_p_value", "", [](const s& x) { return x.hysteresis_p_value; }},
    };
    return columns;
}

namespace {
// A p value for the text: two significant digits, or "< 1e-15" where the normal tail is below
// double precision's resolution of 1 − Φ.
std::string p_text(double p) { return p < 1e-15 ? "p < 1e-15" : fmt::format("p = {:.2g}", p); }
}  // namespace

std::string describe_summary(const fit_summary& s) {
    const weighted_mean& k = s.decay_constant_per_m;
    const weighted_mean& p = s.apparent_barrier_J;
    const double eV = si::electron_volt;
    std::string out = fmt::format(
        "summary of {} sweeps (weighted mean, error scaled by the Birge ratio when above 1):\n"
        "  kappa  {} /nm (Birge ratio {:.2g}; spread between sweeps {:.2g} /nm)\n"
        "  phi_ap {} eV (Birge ratio {:.2g}; spread between sweeps {:.2g} eV)\n",
        k.count, with_uncertainty(k.mean * 1e-9, k.standard_error * 1e-9), k.birge_ratio, k.spread * 1e-9,
        with_uncertainty(p.mean / eV, p.standard_error / eV), p.birge_ratio, p.spread / eV);
    if (std::isfinite(s.hysteresis_per_m)) {
        out += fmt::format("  approach - retract: kappa {} /nm over {} and {} sweeps, {}{}\n",
                           with_uncertainty(s.hysteresis_per_m * 1e-9, s.hysteresis_stderr_per_m * 1e-9),
                           s.approach_decay_per_m.count, s.retract_decay_per_m.count, p_text(s.hysteresis_p_value),
                           s.hysteresis_p_value < 0.01 ? " (significant hysteresis: drift or a tip change?)" : "");
    }
    return out;
}

}  // namespace tipgap
