// The sample work function whose exact-transmission trace puts its resonances where the measured
// ones are (estimate (ii) of tipgap/fit/resonances.hpp), and the whole analysis.
#include <algorithm>
#include <atomic>
#include <boost/math/distributions/normal.hpp>
#include <cmath>
#include <fmt/format.h>

#include "core/detail/parallel.hpp"
#include "fit/detail/fit_internal.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/fit/resonances.hpp"
#include "tipgap/model/geometry.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/predict.hpp"

namespace tipgap {
namespace {

constexpr double J_per_eV = si::electron_volt;
// Peak positions are never trusted beyond 1 mV: the floor keeps noise-free traces' weights finite
// (common practice, no source).
constexpr double kPeakFloor_V = 1e-3;
// The fit stops when a Gauss-Newton step moves phi by less than 1 meV, far inside any interval.
constexpr double kStep_J = 1e-3 * J_per_eV;
// First guess: the lowest resonance sits about 1 eV above the work function at nA setpoints (the
// level of the lowest standing wave in a ~5 V/nm field); the fit moves from there.
constexpr double kFirstLevel_J = 1.0 * J_per_eV;
constexpr double kProbe_J = 0.2 * J_per_eV;    // step of the first secant
constexpr double kMaxStep_J = 1.5 * J_per_eV;  // largest Gauss-Newton step

struct model_trace {
    double phi_J = 0;
    std::vector<double> signal, smoothed;
    std::vector<resonance_peak> peaks;
};

// The configured junction with sample work function phi, exact transmission, at every measured
// bias and the setpoint current: gap (z(V) trace) or dI/dV at that gap (dI/dV trace).
model_trace compute_model(const config& base, const bias_trace& t, double phi, const resonance_options& o) {
    config c = base;
    c.model.method = method_kind::exact;
    c.model.sample.work_function_J = phi;
    for (double V : t.bias_V) c.model.bias_limit_V = std::max(c.model.bias_limit_V, std::abs(V) + 0.5);
    model_trace m;
    m.phi_J = phi;
    const std::size_t n = t.bias_V.size();
    m.signal.assign(n, 0.0);
    std::atomic<bool> reachable{true};
    detail::parallel_for(n, o.threads, [&](std::size_t i) {
        const double V = t.bias_V[i];
        const gap_solution g = solve_gap(c, *t.current_A, V);
        if (!g.reachable()) {
            reachable = false;
            return;
        }
        if (t.kind == trace_kind::zv) {
            m.signal[i] = g.gap_m;
        } else {
            const double h = bias_step(c.model, V);
            m.signal[i] = (total_current(c.model, c.geometry, g.gap_m, V + h) -
                           total_current(c.model, c.geometry, g.gap_m, V - h)) / (2.0 * h);
        }
    });
    if (reachable) m.peaks = find_resonance_peaks(t.kind, t.bias_V, m.signal, o, &m.smoothed);
    return m;
}

struct residuals {
    std::vector<double> r, w, a;  // measured - model (V), weights (1/V^2), sensitivities (V/J)
};

residuals compare(const std::vector<resonance_peak>& measured, const model_trace& m) {
    residuals out;
    const std::size_t n = std::min(measured.size(), m.peaks.size());
    for (std::size_t k = 0; k < n; ++k) {
        const double se = std::max(measured[k].bias_stderr_V, kPeakFloor_V);
        out.r.push_back(measured[k].bias_V - m.peaks[k].bias_V);
        out.w.push_back(1.0 / (se * se));
    }
    return out;
}

// Secant sensitivities dV_n/dphi between two model traces (peaks matched by order); a shift of the
// work function moves every resonance by about as much, so 1/e is the fallback.
std::vector<double> sensitivities(const model_trace& a, const model_trace& b, std::size_t n) {
    std::vector<double> s(n, 1.0 / si::elementary_charge);
    const double dphi = b.phi_J - a.phi_J;
    for (std::size_t k = 0; k < n && k < a.peaks.size() && k < b.peaks.size(); ++k) {
        const double v = (b.peaks[k].bias_V - a.peaks[k].bias_V) / dphi;
        if (std::abs(dphi) > 1e-4 * J_per_eV && v > 0) s[k] = v;
    }
    return s;
}

// Weighted Gauss-Newton step for one parameter: sum w a r / sum w a^2.
double gauss_newton_step(const residuals& res, const std::vector<double>& a, double& information) {
    double num = 0, den = 0;
    for (std::size_t k = 0; k < res.r.size(); ++k) {
        num += res.w[k] * a[k] * res.r[k];
        den += res.w[k] * a[k] * a[k];
    }
    information = den;
    return den > 0 ? num / den : 0.0;
}

void fill_interval(resonance_result& r, const residuals& res, double information, double level) {
    const double N = static_cast<double>(res.r.size());
    double chi2 = 0;
    for (std::size_t k = 0; k < res.r.size(); ++k) chi2 += res.w[k] * res.r[k] * res.r[k];
    const double dof = N - 1.0;
    const double scale = dof > 0 ? std::sqrt(std::max(1.0, chi2 / dof)) : 1.0;
    const double se = scale / std::sqrt(information);
    const double q = dof > 0 ? detail::t_quantile(dof, level)
                             : boost::math::quantile(boost::math::normal(), 0.5 + 0.5 * level);
    r.work_function_stderr_J = se;
    r.work_function_ci_low_J = r.work_function_J - q * se;
    r.work_function_ci_high_J = r.work_function_J + q * se;
}

void store_model(resonance_result& r, const bias_trace& t, const model_trace& m) {
    r.model_peaks_V.clear();
    for (const auto& p : m.peaks) r.model_peaks_V.push_back(p.bias_V);
    r.model_signal = m.signal;
    r.model_smoothed = m.smoothed;
    // Place the model on the measured scale: z is relative (shift), dI/dV often in arbitrary units (scale).
    const std::size_t n = t.signal.size();
    if (t.kind == trace_kind::zv) {
        double shift = 0;
        for (std::size_t i = 0; i < n; ++i) shift += (t.signal[i] - m.signal[i]) / static_cast<double>(n);
        for (double& v : r.model_signal) v += shift;
    } else {
        double num = 0, den = 0;
        for (std::size_t i = 0; i < n; ++i) num += t.signal[i] * m.signal[i], den += m.signal[i] * m.signal[i];
        const double k = den > 0 ? num / den : 1.0;
        for (double& v : r.model_signal) v *= k;
        for (double& v : r.model_smoothed) v *= k;
    }
}

void fit_work_function(const config& c, const bias_trace& t, const resonance_options& o, resonance_result& r) {
    const double phi_lo = 0.5 * J_per_eV, phi_hi = 20.0 * J_per_eV;
    const double phi0 = std::clamp(si::elementary_charge * r.peaks.front().bias_V - kFirstLevel_J, phi_lo, phi_hi);
    model_trace prev = compute_model(c, t, phi0, o);
    model_trace cur = compute_model(c, t, phi0 + kProbe_J, o);
    r.model_traces = 2;
    std::vector<double> a = sensitivities(prev, cur, r.peaks.size());
    double information = 0;
    for (;;) {
        const residuals res = compare(r.peaks, cur);
        if (res.r.empty()) {
            r.status = resonance_status::model_not_converged;
            r.message = "the model traces show no resonance in the measured bias range";
            return;
        }
        const double step = std::clamp(gauss_newton_step(res, a, information), -kMaxStep_J, kMaxStep_J);
        r.work_function_J = cur.phi_J;
        store_model(r, t, cur);
        fill_interval(r, res, information, o.confidence_level);
        if (std::abs(step) < kStep_J) return;
        if (r.model_traces >= o.max_model_traces) {
            r.status = resonance_status::model_not_converged;
            r.message = fmt::format("{} model traces computed without convergence (last step {:.3f} eV)",
                                    r.model_traces, step / J_per_eV);
            return;
        }
        model_trace next = compute_model(c, t, std::clamp(cur.phi_J + step, phi_lo, phi_hi), o);
        ++r.model_traces;
        const auto s = sensitivities(cur, next, r.peaks.size());
        a = s;
        prev = std::move(cur);
        cur = std::move(next);
    }
}

}  // namespace

resonance_result analyse_resonances(const config& c, const bias_trace& t, const resonance_options& o) {
    o.validate();
    resonance_result r;
    r.kind = t.kind;
    r.smoothing_width_V = 2.0 * o.smoothing_half_width_V;
    r.bias_V = t.bias_V;
    r.confidence_level = o.confidence_level;
    r.peaks = find_resonance_peaks(t.kind, t.bias_V, t.signal, o, &r.smoothed);
    if (r.peaks.empty()) {
        r.status = resonance_status::no_peaks;
        r.message = fmt::format("no resonance found with a {:g} V smoothing window; the trace may end below the "
                                "sample work function, or the peaks are weaker than the noise",
                                r.smoothing_width_V);
        return r;
    }
    triangular_well_estimate(t, r);
    if (!o.model_fit) {
        r.status = resonance_status::formula_only;
        r.message = "model fit not asked for";
        return r;
    }
    if (!t.current_A) {
        location w{t.file, 0, 0, "current"};
        throw_input(w, "the trace has no '# current:' line; the model fit needs the setpoint current (e.g. "
                       "'# current: 1 nA')");
    }
    if (r.peaks.front().bias_V <= 0) {
        r.status = resonance_status::formula_only;
        r.message = "the resonances are at negative sample bias (the tip's); the model fits the sample's";
        return r;
    }
    fit_work_function(c, t, o, r);
    return r;
}

}  // namespace tipgap
