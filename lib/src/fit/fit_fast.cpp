// The linear model of fit_sweep for many pixels: the same point selection and statistics
// (point_selection.hpp), no profile, no warnings, no allocation per call once the workspace has
// grown, and the weighted straight line of fit_line without its input checks (the selection
// has made the points finite).
#include <cmath>

#include "fit/detail/centred_line.hpp"
#include "fit/detail/fit_fast.hpp"

namespace tipgap {
namespace {

// The weighted line ln|I| = intercept + slope z over the points idx with weights w.
line_fit pixel_line(const detail::sorted_sweep& s, std::span<const std::size_t> idx, std::span<const double> w) {
    return detail::centred_line(
        idx.size(), [&](std::size_t k) { return s.z[idx[k]]; }, [&](std::size_t k) { return s.ln_abs_current[idx[k]]; },
        [&](std::size_t k) { return w[k]; });
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
    const detail::linear_points linear = detail::fit_linear_points(ws, selection, pixel_line);
    r.points_used = ws.used.size();
    if (linear.status != detail::linear_status::fitted) return false;
    detail::record_linear_fit(r, ws, linear.line);
    return true;
}

}  // namespace tipgap
