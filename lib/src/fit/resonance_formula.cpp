// Work function from the triangular-well formula (estimate (i) of tipgap/fit/resonances.hpp).
#include <cmath>
#include <numbers>

#include "tipgap/core/constants.hpp"
#include "tipgap/fit/resonances.hpp"

namespace tipgap {
namespace {

// (3 pi hbar e / (2 sqrt(2m)))^(2/3): the well's level scale per F^(2/3) n^(2/3), in J (V/m)^(-2/3).
double level_scale() {
    static const double c = std::pow(3.0 * std::numbers::pi * si::hbar * si::elementary_charge /
                                         (2.0 * std::sqrt(2.0 * si::electron_mass)),
                                     2.0 / 3.0);
    return c;
}

struct line_fit {
    double a = 0, b = 0, b_stderr = 0, a_stderr = 0;  // y = a + b x
    bool ok = false;
};

// Ordinary least squares with the standard errors from the residual scatter (n >= 3).
line_fit fit_line(const std::vector<double>& x, const std::vector<double>& y) {
    line_fit f;
    const double n = static_cast<double>(x.size());
    if (x.size() < 2) return f;
    double mx = 0, my = 0;
    for (std::size_t i = 0; i < x.size(); ++i) mx += x[i] / n, my += y[i] / n;
    double sxx = 0, sxy = 0;
    for (std::size_t i = 0; i < x.size(); ++i) sxx += (x[i] - mx) * (x[i] - mx), sxy += (x[i] - mx) * (y[i] - my);
    if (!(sxx > 0)) return f;
    f.b = sxy / sxx;
    f.a = my - f.b * mx;
    f.ok = true;
    if (x.size() >= 3) {
        double rss = 0;
        for (std::size_t i = 0; i < x.size(); ++i) rss += std::pow(y[i] - f.a - f.b * x[i], 2);
        const double s2 = rss / (n - 2.0);
        f.b_stderr = std::sqrt(s2 / sxx);
        f.a_stderr = std::sqrt(s2 * (1.0 / n + mx * mx / sxx));
    } else {
        f.b_stderr = f.a_stderr = std::numeric_limits<double>::quiet_NaN();
    }
    return f;
}

// z(V): F from the slope of z over the peaks, then phi_n = e V_n - C F^(2/3) n^(2/3) averaged.
void from_slope(const bias_trace& t, resonance_result& r) {
    const auto& p = r.peaks;
    const double lo = p.front().bias_V - 0.5 * r.smoothing_width_V, hi = p.back().bias_V + 0.5 * r.smoothing_width_V;
    std::vector<double> V, z;
    for (std::size_t i = 0; i < t.bias_V.size(); ++i) {
        if (t.bias_V[i] >= lo && t.bias_V[i] <= hi) V.push_back(t.bias_V[i]), z.push_back(t.signal[i]);
    }
    const line_fit f = fit_line(V, z);
    if (!f.ok || !(f.b > 0)) return;  // z must grow with V at constant current
    const double F = 1.0 / f.b, F_se = f.b_stderr / (f.b * f.b);
    const double C = level_scale() * std::pow(F, 2.0 / 3.0);
    double sum = 0, sum2 = 0, mean_n23 = 0;
    const double N = static_cast<double>(p.size());
    for (const auto& q : p) {
        const double n23 = std::pow(static_cast<double>(q.order), 2.0 / 3.0);
        const double phi = si::elementary_charge * q.bias_V - C * n23;
        sum += phi;
        sum2 += phi * phi;
        mean_n23 += n23 / N;
    }
    const double mean = sum / N;
    const double scatter = p.size() >= 2 ? std::sqrt(std::max(0.0, (sum2 - N * mean * mean) / (N - 1.0)) / N)
                                         : si::elementary_charge * p.front().bias_stderr_V;
    const double dphi_dF = -(2.0 / 3.0) * C / F * mean_n23;
    r.field_V_per_m = F;
    r.field_stderr_V_per_m = F_se;
    r.work_function_formula_J = mean;
    r.work_function_formula_stderr_J = std::hypot(scatter, std::isfinite(F_se) ? dphi_dF * F_se : 0.0);
}

// dI/dV(V): no z, so e V_n = phi + b n^(2/3) is fitted for phi and b = C F^(2/3).
void from_series(resonance_result& r) {
    if (r.peaks.size() < 2) return;
    std::vector<double> x, y;
    for (const auto& q : r.peaks) {
        x.push_back(std::pow(static_cast<double>(q.order), 2.0 / 3.0));
        y.push_back(si::elementary_charge * q.bias_V);
    }
    const line_fit f = fit_line(x, y);
    if (!f.ok || !(f.b > 0)) return;
    const double F = std::pow(f.b / level_scale(), 1.5);
    r.field_V_per_m = F;
    r.field_stderr_V_per_m = 1.5 * F / f.b * f.b_stderr;
    r.work_function_formula_J = f.a;
    r.work_function_formula_stderr_J = f.a_stderr;
}

}  // namespace

void triangular_well_estimate(const bias_trace& t, resonance_result& r) {
    if (r.peaks.empty()) return;
    if (t.kind == trace_kind::zv) {
        from_slope(t, r);
    } else {
        from_series(r);
    }
}

}  // namespace tipgap
