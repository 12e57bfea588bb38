// The linear model of fit_sweep for many pixels: same selection and statistics, no profile, no
// warnings, no allocation per call once the workspace has grown, and the weighted straight line
// from centred sums instead of an SVD (2 unknowns: the closed form is exact up to rounding and
// the centring keeps it well conditioned).
#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

#include "fit/detail/fit_internal.hpp"

namespace tipgap {
namespace {

// Weighted least-squares line y = intercept + slope x over x[idx], y[idx] with weights w
// (Bevington & Robinson, Data Reduction and Error Analysis, 3rd ed. (2003), eqs. 6.12 and
// 6.21-6.22, written about the weighted mean of x). Same outputs as fit_line.
line_fit centred_line(const std::vector<double>& x, const std::vector<double>& y, const std::vector<std::size_t>& idx,
                      const std::vector<double>& w) {
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

double cached_t(fit_workspace& ws, double dof, double level) {
    if (ws.t_cache_level != level) {
        ws.t_cache.clear();
        ws.t_cache_level = level;
    }
    const auto k = static_cast<std::size_t>(dof);
    if (ws.t_cache.size() <= k) ws.t_cache.resize(k + 1, std::numeric_limits<double>::quiet_NaN());
    if (std::isnan(ws.t_cache[k])) ws.t_cache[k] = detail::t_quantile(dof, level);
    return ws.t_cache[k];
}

}  // namespace

bool fit_sweep_fast(std::span<const double> z_in, std::span<const double> current_in, double bias_V,
                    const fit_options& opt, fit_workspace& ws, fit_result& r) {
    r = fit_result{};
    r.model = fit_model::linear;
    r.confidence_level = opt.confidence_level;
    r.calibration_uncertainty = opt.calibration_uncertainty;
    const std::size_t n = z_in.size();
    r.points_total = n;
    if (n < 3) return false;

    // Sorted by z, closest first, as fit_sweep does with a stable sort; the two common layouts
    // (ascending, strictly descending) need no sort.
    std::vector<double>& z = ws.z;
    std::vector<double>& current = ws.current;
    std::vector<double>& a = ws.a;
    z.resize(n);
    current.resize(n);
    a.resize(n);
    bool ascending = true, strictly_descending = true;
    for (std::size_t i = 1; i < n; ++i) {
        if (z_in[i] < z_in[i - 1]) ascending = false;
        if (z_in[i] >= z_in[i - 1]) strictly_descending = false;
    }
    if (ascending) {
        std::copy(z_in.begin(), z_in.end(), z.begin());
        std::copy(current_in.begin(), current_in.end(), current.begin());
    } else if (strictly_descending) {
        std::reverse_copy(z_in.begin(), z_in.end(), z.begin());
        std::reverse_copy(current_in.begin(), current_in.end(), current.begin());
    } else {
        ws.order.resize(n);
        std::iota(ws.order.begin(), ws.order.end(), std::size_t{0});
        std::stable_sort(ws.order.begin(), ws.order.end(), [&](std::size_t i, std::size_t j) { return z_in[i] < z_in[j]; });
        for (std::size_t k = 0; k < n; ++k) {
            z[k] = z_in[ws.order[k]];
            current[k] = current_in[ws.order[k]];
        }
    }
    bool ties = false;
    double a_max = 0.0;
    for (std::size_t k = 0; k < n; ++k) {
        a[k] = std::abs(current[k]);
        a_max = std::max(a_max, a[k]);
        if (k > 0 && z[k] == z[k - 1]) ties = true;
    }

    // Noise from the far tail. estimate_noise orders by decreasing z with an unstable sort, so
    // with tied z values its order is its own: use it then.
    noise_estimate est;
    if (ties) {
        est = estimate_noise(z, current);
    } else {
        ws.far_first.resize(n);
        std::reverse_copy(current.begin(), current.end(), ws.far_first.begin());
        est = detail::noise_from_far_first(ws.far_first, ws.scratch);
    }
    r.current_noise_estimated = opt.current_noise_A <= 0.0;
    double sigma = r.current_noise_estimated ? est.current_noise_A : opt.current_noise_A;
    if (!(sigma > 0.0)) sigma = detail::noiseless_sigma_fraction * a_max;
    r.current_noise_A = sigma;
    r.noise_floor_estimated = opt.noise_floor_A <= 0.0;
    const double floor = r.noise_floor_estimated ? est.noise_floor_A : opt.noise_floor_A;
    r.noise_floor_A = floor;
    double sat = opt.saturation_A;
    if (sat <= 0.0) {
        sat = detail::detect_saturation(a, sigma);
        r.saturation_detected = sat > 0.0;
    }
    r.saturation_A = sat;
    r.contact = detail::detect_contact(z, a, floor, bias_V, opt.contact_distance_m);
    const std::size_t first = r.contact.points_in_contact;
    // As fit_sweep: a "flat top" wholly inside the contact is the contact, not the amplifier.
    if (r.saturation_detected) {
        bool any = false;
        for (std::size_t i = first; i < n && !any; ++i) any = a[i] >= sat;
        if (!any) {
            r.saturation_detected = false;
            r.saturation_A = sat = 0.0;
        }
    }
    auto eligible = [&](std::size_t i) { return i >= first && (sat <= 0.0 || a[i] < sat) && a[i] > 0.0; };
    for (std::size_t i = first; i < n; ++i) {
        if (sat > 0.0 && a[i] >= sat) ++r.points_saturated;
        if (a[i] < floor) ++r.points_below_floor;
    }

    std::vector<std::size_t>& used = ws.used;
    std::vector<double>& w = ws.weights;
    used.clear();
    for (std::size_t i = 0; i < n; ++i) {
        if (eligible(i) && a[i] >= floor) used.push_back(i);
    }
    r.points_used = used.size();
    if (used.size() < 3) return false;

    std::vector<double>& ln_a = ws.ln_a;
    ln_a.resize(n);
    for (std::size_t i = 0; i < n; ++i) ln_a[i] = a[i] > 0.0 ? std::log(a[i]) : 0.0;
    // No spread in z (repeated piezo steps): the slope is undefined, so there is no fit (as
    // fit_sweep, which refuses such a sweep).
    if (!(z[used.back()] > z[used.front()])) return false;
    // Weights (I/σ_I)² relative to the largest, as in fit_sweep: only their ratios enter the fit,
    // and ratios cannot overflow where (I/σ_I)² can.
    auto relative_squares = [](std::vector<double>& v) {
        double ref = 0.0;
        for (double x : v) ref = std::max(ref, x);
        for (double& x : v) x = (x / ref) * (x / ref);
    };
    w.resize(used.size());
    for (std::size_t k = 0; k < used.size(); ++k) w[k] = a[used[k]];
    relative_squares(w);
    line_fit line = centred_line(z, ln_a, used, w);
    for (int pass = 1; pass < detail::linear_passes; ++pass) {
        std::vector<std::size_t>& next = ws.next;
        std::vector<double>& next_w = ws.next_weights;
        next.clear();
        next_w.clear();
        for (std::size_t i = 0; i < n; ++i) {
            // The cheap tests first: the exponential is only needed for points that pass them.
            if (!eligible(i) || !(a[i] >= detail::observed_floor_fraction * floor)) continue;
            const double fitted = std::exp(line.intercept + line.slope * z[i]);
            if (std::isfinite(fitted) && fitted >= floor) {
                next.push_back(i);
                next_w.push_back(fitted);
            }
        }
        if (next.size() < 3) break;
        relative_squares(next_w);
        const bool same = next == used;
        // A singular reweighted problem (all weight on one z) keeps the last well-posed line.
        const line_fit candidate = centred_line(z, ln_a, next, next_w);
        if (!std::isfinite(candidate.slope) || !std::isfinite(candidate.slope_stderr) ||
            !std::isfinite(candidate.intercept_stderr)) {
            break;
        }
        used.swap(next);
        w.swap(next_w);
        line = candidate;
        if (same) break;
    }
    if (!std::isfinite(line.slope) || !std::isfinite(line.slope_stderr)) return false;

    r.z_ref_m = z[used.front()];
    r.line = line;
    r.iterations = 1;
    r.points_used = used.size();
    r.prefactor_A = std::exp(line.intercept + line.slope * r.z_ref_m);
    const double var_ln = line.intercept_stderr * line.intercept_stderr +
                          r.z_ref_m * r.z_ref_m * line.slope_stderr * line.slope_stderr +
                          2.0 * r.z_ref_m * line.covariance;
    r.prefactor_stderr_A = r.prefactor_A * std::sqrt(std::max(var_ln, 0.0));
    r.r_squared = line.r_squared;
    r.residual_rms_ln = line.residual_rms;
    double ss = 0.0, lo = std::numeric_limits<double>::infinity(), hi = 0.0;
    for (std::size_t i : used) {
        const double d = a[i] - std::exp(line.intercept + line.slope * z[i]);
        ss += d * d;
        lo = std::min(lo, a[i]);
        hi = std::max(hi, a[i]);
    }
    r.residual_rms_A = std::sqrt(ss / static_cast<double>(used.size()));
    r.current_decades_used = std::log10(hi / lo);
    r.reduced_chi_square = line.residual_std * line.residual_std;
    const double dof = static_cast<double>(used.size()) - 2.0;
    detail::fill_decay(r, -0.5 * line.slope, 0.5 * line.slope_stderr, dof, cached_t(ws, dof, opt.confidence_level));
    return true;
}

}  // namespace tipgap
