// The point selection shared by fit_sweep and fit_sweep_fast; see point_selection.hpp.
#include "fit/detail/point_selection.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

namespace tipgap::detail {

void sorted_sweep::assign(std::span<const double> z_in, std::span<const double> current_in) {
    const std::size_t n = z_in.size();
    z.resize(n);
    current.resize(n);
    abs_current.resize(n);
    order.resize(n);
    // The two common layouts (ascending, strictly descending) are already in stable-sort order
    // or its reverse, and need no sort.
    bool ascending = true, strictly_descending = true;
    for (std::size_t i = 1; i < n; ++i) {
        if (z_in[i] < z_in[i - 1]) ascending = false;
        if (z_in[i] >= z_in[i - 1]) strictly_descending = false;
    }
    if (ascending) {
        std::iota(order.begin(), order.end(), std::size_t{0});
    } else if (strictly_descending) {
        for (std::size_t k = 0; k < n; ++k) order[k] = n - 1 - k;
    } else {
        std::iota(order.begin(), order.end(), std::size_t{0});
        std::stable_sort(order.begin(), order.end(), [&](std::size_t i, std::size_t j) { return z_in[i] < z_in[j]; });
    }
    ties = false;
    max_abs_current = 0.0;
    for (std::size_t k = 0; k < n; ++k) {
        z[k] = z_in[order[k]];
        current[k] = current_in[order[k]];
        abs_current[k] = std::abs(current[k]);
        max_abs_current = std::max(max_abs_current, abs_current[k]);
        if (k > 0 && z[k] == z[k - 1]) ties = true;
    }
}

void point_selection::record(fit_result& r) const {
    r.current_noise_A = current_noise_A;
    r.current_noise_estimated = current_noise_estimated;
    r.noise_floor_A = noise_floor_A;
    r.noise_floor_estimated = noise_floor_estimated;
    r.saturation_A = saturation_A;
    r.saturation_detected = saturation_detected;
    r.contact = contact;
    r.points_saturated = points_saturated;
    r.points_below_floor = points_below_floor;
}

namespace {

// Noise from the far tail. estimate_noise orders by decreasing z with an unstable sort, so with
// tied z its order is its own: use it then; otherwise that order is the sorted sweep reversed.
noise_estimate tail_noise(fit_workspace& ws) {
    const sorted_sweep& s = ws.sweep;
    if (s.ties) return estimate_noise(s.z, s.current);
    ws.far_first.resize(s.current.size());
    std::reverse_copy(s.current.begin(), s.current.end(), ws.far_first.begin());
    return noise_from_far_first(ws.far_first, ws.scratch);
}

// A conductance plateau is flat too: a "flat top" that lies wholly inside the contact is the
// contact, not the amplifier.
void drop_saturation_inside_contact(point_selection& sel, const std::vector<double>& a) {
    if (!sel.saturation_detected) return;
    for (std::size_t i = sel.contact.points_in_contact; i < a.size(); ++i) {
        if (a[i] >= sel.saturation_A) return;
    }
    sel.saturation_detected = false;
    sel.saturation_A = 0.0;
}

}  // namespace

point_selection select_points(fit_workspace& ws, double bias_V, const fit_options& opt) {
    const sorted_sweep& s = ws.sweep;
    const std::vector<double>& a = s.abs_current;
    point_selection sel;
    sel.noise = tail_noise(ws);
    sel.current_noise_estimated = opt.current_noise_A <= 0.0;
    double sigma = sel.current_noise_estimated ? sel.noise.current_noise_A : opt.current_noise_A;
    if (!(sigma > 0.0)) {
        sigma = noiseless_sigma_fraction * s.max_abs_current;
        sel.noiseless = true;
    }
    sel.current_noise_A = sigma;
    sel.noise_floor_estimated = opt.noise_floor_A <= 0.0;
    sel.noise_floor_A = sel.noise_floor_estimated ? sel.noise.noise_floor_A : opt.noise_floor_A;
    sel.saturation_A = opt.saturation_A;
    if (sel.saturation_A <= 0.0) {
        sel.saturation_A = detect_saturation(a, sigma);
        sel.saturation_detected = sel.saturation_A > 0.0;
    }
    sel.contact = detect_contact(s.z, a, sel.noise_floor_A, bias_V, opt.contact_distance_m);
    drop_saturation_inside_contact(sel, a);
    for (std::size_t i = sel.contact.points_in_contact; i < a.size(); ++i) {
        if (sel.saturation_A > 0.0 && a[i] >= sel.saturation_A) ++sel.points_saturated;
        if (a[i] < sel.noise_floor_A) ++sel.points_below_floor;
    }
    return sel;
}

namespace {

// Weights (I/σ_I)² taken relative to the largest: the line fits scale the covariance by the
// residual variance, so only ratios of weights matter, and ratios cannot overflow where (I/σ_I)²
// can (a wild fitted line gives exp(...) near 1e308). v: the currents (or fitted currents), > 0.
void relative_squares(std::vector<double>& v) {
    double ref = 0.0;
    for (double x : v) ref = std::max(ref, x);
    for (double& x : v) x = (x / ref) * (x / ref);
}

// One reweighting pass: the usable points whose fitted current reaches the floor and whose
// observed current shows at least observed_floor_fraction of it, into ws.next / ws.next_weights.
void reselect(fit_workspace& ws, const point_selection& sel, const line_fit& line) {
    const sorted_sweep& s = ws.sweep;
    const double floor = sel.noise_floor_A;
    ws.next.clear();
    ws.next_weights.clear();
    for (std::size_t i = 0; i < s.z.size(); ++i) {
        // The cheap tests first: the exponential is only needed for points that pass them.
        if (!sel.usable_by_linear(i, s.abs_current[i]) || !(s.abs_current[i] >= observed_floor_fraction * floor)) continue;
        const double fitted = std::exp(line.intercept + line.slope * s.z[i]);
        // An overflowing extrapolation of the line says nothing about the point's weight.
        if (std::isfinite(fitted) && fitted >= floor) {
            ws.next.push_back(i);
            ws.next_weights.push_back(fitted);
        }
    }
}

bool finite_line(const line_fit& l) {
    return std::isfinite(l.slope) && std::isfinite(l.slope_stderr) && std::isfinite(l.intercept) &&
           std::isfinite(l.intercept_stderr);
}

}  // namespace

linear_points fit_linear_points(fit_workspace& ws, const point_selection& sel, line_solver solve) {
    sorted_sweep& s = ws.sweep;
    const std::size_t n = s.z.size();
    linear_points out;
    ws.used.clear();
    for (std::size_t i = 0; i < n; ++i) {
        if (sel.usable_by_linear(i, s.abs_current[i]) && s.abs_current[i] >= sel.noise_floor_A) ws.used.push_back(i);
    }
    if (ws.used.size() < 3) {
        out.status = linear_status::too_few_points;
        return out;
    }
    // z is sorted, so the used points span [z[used.front()], z[used.back()]]. Without a spread in z
    // the slope of ln|I| is undefined (the least-squares problem is singular).
    if (!(s.z[ws.used.back()] > s.z[ws.used.front()])) {
        out.status = linear_status::no_spread_in_z;
        return out;
    }
    s.ln_abs_current.resize(n);
    for (std::size_t i = 0; i < n; ++i) s.ln_abs_current[i] = s.abs_current[i] > 0.0 ? std::log(s.abs_current[i]) : 0.0;
    ws.weights.resize(ws.used.size());
    for (std::size_t k = 0; k < ws.used.size(); ++k) ws.weights[k] = s.abs_current[ws.used[k]];
    relative_squares(ws.weights);
    out.line = solve(s, ws.used, ws.weights);
    for (int pass = 1; pass < linear_passes; ++pass) {
        reselect(ws, sel, out.line);
        if (ws.next.size() < 3) break;
        relative_squares(ws.next_weights);
        const bool same = ws.next == ws.used;
        // A wild line (an outlier far out in z) can give weights that leave fewer than two
        // distinct z with any weight: the reweighted problem is then singular and its standard
        // errors NaN. Keep the last well-posed fit instead.
        const line_fit candidate = solve(s, ws.next, ws.next_weights);
        if (!finite_line(candidate)) break;
        ws.used.swap(ws.next);
        ws.weights.swap(ws.next_weights);
        out.line = candidate;
        if (same) break;
    }
    if (!std::isfinite(out.line.slope) || !std::isfinite(out.line.slope_stderr)) out.status = linear_status::singular;
    return out;
}

double current_decades(const fit_workspace& ws) {
    double lo = std::numeric_limits<double>::infinity(), hi = 0.0;
    for (std::size_t i : ws.used) {
        lo = std::min(lo, ws.sweep.abs_current[i]);
        hi = std::max(hi, ws.sweep.abs_current[i]);
    }
    return std::log10(hi / lo);
}

void record_linear_fit(fit_result& r, fit_workspace& ws, const line_fit& line) {
    const sorted_sweep& s = ws.sweep;
    const std::vector<std::size_t>& used = ws.used;
    r.z_ref_m = s.z[used.front()];
    r.line = line;
    r.iterations = 1;
    r.points_used = used.size();
    r.prefactor_A = std::exp(line.intercept + line.slope * r.z_ref_m);
    // ln I0(z_ref) = intercept + slope z_ref; its variance from the line covariance, then
    // σ_I0 = I0 σ_lnI0.
    const double var_ln = line.intercept_stderr * line.intercept_stderr +
                          r.z_ref_m * r.z_ref_m * line.slope_stderr * line.slope_stderr +
                          2.0 * r.z_ref_m * line.covariance;
    r.prefactor_stderr_A = r.prefactor_A * std::sqrt(std::max(var_ln, 0.0));
    r.r_squared = line.r_squared;
    r.residual_rms_ln = line.residual_rms;
    // χ² against the noise model: σ_lnI = σ_I/I_fit, so w = (I_fit/σ_I)² (r.current_noise_A is
    // set by point_selection::record before).
    double ss = 0.0, chi2 = 0.0;
    for (std::size_t i : used) {
        const double fit = std::exp(line.intercept + line.slope * s.z[i]);
        const double d = s.abs_current[i] - fit;
        const double dln = s.ln_abs_current[i] - std::log(fit);
        ss += d * d;
        chi2 += dln * dln * (fit / r.current_noise_A) * (fit / r.current_noise_A);
    }
    r.residual_rms_A = std::sqrt(ss / static_cast<double>(used.size()));
    r.current_decades_used = current_decades(ws);
    const double dof = static_cast<double>(used.size()) - 2.0;
    r.reduced_chi_square = r.current_noise_A > 0.0 ? chi2 / dof : 0.0;
    fill_decay(r, -0.5 * line.slope, 0.5 * line.slope_stderr, dof, t_quantile(dof, r.confidence_level));
}

}  // namespace tipgap::detail
