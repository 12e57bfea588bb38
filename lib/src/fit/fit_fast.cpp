// The linear model of fit_sweep for many pixels: the same point selection and statistics
// (point_selection.hpp), no profile, no warnings, no allocation per call once the workspace has
// grown, and the weighted straight line from centred sums instead of an SVD (2 unknowns: the
// closed form is exact up to rounding and the centring keeps it well conditioned).
#include <cmath>

#include "fit/detail/fit_fast.hpp"

namespace tipgap {
namespace {

// Weighted least-squares line ln|I| = intercept + slope z over the points idx with weights w
// (Bevington & Robinson, Data Reduction and Error Analysis, 3rd ed. (2003), eqs. 6.12 and
// 6.21-6.22, written about the weighted mean of z). Same outputs as fit_line.
line_fit centred_line(const detail::sorted_sweep& s, std::span<const std::size_t> idx, std::span<const double> w) {
    const std::vector<double>& x = s.z;
    const std::vector<double>& y = s.ln_abs_current;
    const std::size_t n = idx.size();
    double sw = 0.0, swx = 0.0, swy = 0.0;
    for (std::size_t k = 0; k < n; ++k) {
        sw += w[k];
        swx += w[k] * x[idx[k]];
        swy += w[k] * y[idx[k]];
    }
    const double x_mean = swx / sw, y_mean = swy / sw;
    double sxx = 0.0, sxy = 0.0, syy = 0.0;
    for (std::size_t k = 0; k < n; ++k) {
        const double dx = x[idx[k]] - x_mean, dy = y[idx[k]] - y_mean;
        sxx += w[k] * dx * dx;
        sxy += w[k] * dx * dy;
        syy += w[k] * dy * dy;
    }
    line_fit out;
    out.points = n;
    out.slope = sxy / sxx;
    out.intercept = y_mean - out.slope * x_mean;
    double ssr_w = 0.0, ssr = 0.0;
    for (std::size_t k = 0; k < n; ++k) {
        const double r = y[idx[k]] - (y_mean + out.slope * (x[idx[k]] - x_mean));
        ssr_w += w[k] * r * r;
        ssr += r * r;
    }
    const double dof = static_cast<double>(n) - 2.0;
    const double s2 = dof > 0 ? ssr_w / dof : 0.0;
    out.slope_stderr = std::sqrt(s2 / sxx);
    out.intercept_stderr = std::sqrt(s2 * (1.0 / sw + x_mean * x_mean / sxx));
    out.covariance = -x_mean * s2 / sxx;
    out.residual_std = std::sqrt(s2);
    out.r_squared = syy > 0.0 ? 1.0 - ssr_w / syy : 1.0;
    out.residual_rms = std::sqrt(ssr / static_cast<double>(n));
    return out;
}

}  // namespace

bool fit_sweep_fast(std::span<const double> z_in, std::span<const double> current_in, double bias_V,
                    const fit_options& opt, fit_workspace& ws, fit_result& r) {
    r = fit_result{};
    r.model = fit_model::linear;
    r.confidence_level = opt.confidence_level;
    r.calibration_uncertainty = opt.calibration_uncertainty;
    r.points_total = z_in.size();
    if (z_in.size() < 3) return false;

    ws.sweep.assign(z_in, current_in);
    const detail::point_selection selection = detail::select_points(ws, bias_V, opt);
    selection.record(r);
    const detail::linear_points linear = detail::fit_linear_points(ws, selection, centred_line);
    r.points_used = ws.used.size();
    if (linear.status != detail::linear_status::fitted) return false;
    detail::record_linear_fit(r, ws, linear.line);
    return true;
}

}  // namespace tipgap
