// Fitting one sweep: point selection (noise floor, saturation, contact), the linear or offset
// model, uncertainties with the piezo calibration folded in, and the local φ_ap(z) profile.
#include <algorithm>
#include <boost/math/distributions/students_t.hpp>
#include <cmath>
#include <fmt/format.h>
#include <limits>
#include <vector>

#include "fit/detail/point_selection.hpp"
#include "fit/detail/sliding_line.hpp"
#include "tipgap/core/constants.hpp"

namespace tipgap {

void fit_options::validate() const {
    // "<key>: <value> is out of range; expected <range>", the format of every range error.
    auto bad = [](const char* key, const std::string& value, const std::string& expected) {
        throw_input(location{"", 0, 0, key}, fmt::format("{} is out of range; expected {}", value, expected));
    };
    auto amps = [](double v) { return fmt::format("{:g} A", v); };
    if (!(noise_floor_A >= 0.0) || !std::isfinite(noise_floor_A))
        bad("noise_floor_A", amps(noise_floor_A), "a current >= 0 (0 = estimate)");
    if (!(saturation_A >= 0.0) || !std::isfinite(saturation_A))
        bad("saturation_A", amps(saturation_A), "a current >= 0 (0 = detect)");
    if (!(current_noise_A >= 0.0) || !std::isfinite(current_noise_A))
        bad("current_noise_A", amps(current_noise_A), "a current >= 0 (0 = estimate)");
    if (!(calibration_uncertainty >= 0.0 && calibration_uncertainty < 0.5))
        bad("calibration_uncertainty", fmt::format("{:g}", calibration_uncertainty),
            "a relative uncertainty in [0, 0.5), e.g. 0.02");
    // Beyond [0.5, 0.9999] a t quantile is dominated by the tail approximation of a few points.
    if (!(confidence_level >= 0.5 && confidence_level <= 0.9999))
        bad("confidence_level", fmt::format("{:g}", confidence_level), "a level in [0.5, 0.9999], e.g. 0.95");
    if (window_points != 0 && window_points < 4)
        bad("window_points", fmt::format("{} points", window_points), "at least 4 points (or 0 for the default)");
    if (!(window_m >= 0.0) || !std::isfinite(window_m))
        bad("window_m", fmt::format("{:g} nm", window_m / 1e-9), "a length >= 0");
    if (!(contact_distance_m > 0.0) || !std::isfinite(contact_distance_m))
        bad("contact_distance_m", fmt::format("{:g} nm", contact_distance_m / 1e-9), "a length > 0");
    if (max_evaluations < 10) bad("max_evaluations", fmt::format("{}", max_evaluations), "at least 10");
    if (saturation_A > 0.0 && noise_floor_A > 0.0 && saturation_A <= noise_floor_A)
        bad("saturation_A", amps(saturation_A), fmt::format("a saturation above the noise floor of {}", amps(noise_floor_A)));
}

double apparent_barrier_from_decay(double decay_constant_per_m) {
    return si::hbar * si::hbar * decay_constant_per_m * decay_constant_per_m / (2.0 * si::electron_mass);
}

namespace {

// Default profile window: a fifth of the used points, at least 8 (common practice, no source).
constexpr std::size_t default_window_min = 8;
constexpr std::size_t min_window_points = 4;

// The weighted line of ln|I| over the points idx by SVD (fit_line).
line_fit svd_line(const detail::sorted_sweep& s, std::span<const std::size_t> idx, std::span<const double> w) {
    std::vector<double> x(idx.size()), y(idx.size());
    for (std::size_t k = 0; k < idx.size(); ++k) {
        x[k] = s.z[idx[k]];
        y[k] = s.ln_abs_current[idx[k]];
    }
    return fit_line(x, y, w);
}

}  // namespace

double detail::t_quantile(double dof, double confidence_level) {
    // Per thread, the quantiles of whole degrees of freedom at the last confidence level asked:
    // the curves of a file or a summary ask for a few levels and nearby dof, and Boost's inverse
    // incomplete beta costs as much as a whole straight-line fit.
    thread_local double level = std::numeric_limits<double>::quiet_NaN();
    thread_local std::vector<double> by_dof;
    constexpr double max_cached_dof = 65536.0;
    const bool whole = dof >= 1.0 && dof <= max_cached_dof && dof == std::floor(dof);
    if (whole && confidence_level == level) {
        const auto k = static_cast<std::size_t>(dof);
        if (k < by_dof.size() && !std::isnan(by_dof[k])) return by_dof[k];
    }
    boost::math::students_t dist(dof);
    const double t = boost::math::quantile(dist, 0.5 + 0.5 * confidence_level);
    if (whole) {
        if (confidence_level != level) {
            by_dof.clear();
            level = confidence_level;
        }
        const auto k = static_cast<std::size_t>(dof);
        if (k >= by_dof.size()) by_dof.resize(k + 1, std::numeric_limits<double>::quiet_NaN());
        by_dof[k] = t;
    }
    return t;
}

void detail::fill_decay(fit_result& r, double kappa, double kappa_stat_se, double dof, double t) {
    r.decay_constant_per_m = kappa;
    r.decay_constant_stat_stderr_per_m = kappa_stat_se;
    // Piezo calibration: z scales by (1 ± u), κ by 1/(1 ± u), so a relative standard uncertainty u
    // on κ, independent of the statistical one.
    const double cal = r.calibration_uncertainty * std::abs(kappa);
    r.decay_constant_stderr_per_m = std::hypot(kappa_stat_se, cal);
    r.degrees_of_freedom = dof;
    r.t_quantile = t;
    r.decay_constant_ci_low_per_m = kappa - r.t_quantile * r.decay_constant_stderr_per_m;
    r.decay_constant_ci_high_per_m = kappa + r.t_quantile * r.decay_constant_stderr_per_m;
    r.apparent_barrier_J = apparent_barrier_from_decay(kappa);
    r.apparent_barrier_stderr_J =
        kappa != 0.0 ? 2.0 * r.apparent_barrier_J * r.decay_constant_stderr_per_m / std::abs(kappa) : 0.0;
    // φ is monotonic in |κ|, so the κ interval maps onto a φ interval (asymmetric, never negative).
    const double lo = r.decay_constant_ci_low_per_m, hi = r.decay_constant_ci_high_per_m;
    r.apparent_barrier_ci_low_J = lo > 0.0 || hi < 0.0 ? apparent_barrier_from_decay(std::min(std::abs(lo), std::abs(hi))) : 0.0;
    r.apparent_barrier_ci_high_J = apparent_barrier_from_decay(std::max(std::abs(lo), std::abs(hi)));
    r.length_per_decade_m = kappa != 0.0 ? std::log(10.0) / (2.0 * kappa) : std::numeric_limits<double>::infinity();
}

namespace {

// The φ_ap(z) profile: the weighted line over each window of consecutive used points, from the
// running sums of detail::sliding_line (O(1) per window instead of one SVD each).
std::vector<profile_point> local_profile(const fit_workspace& ws, const fit_options& opt, const contact_result& contact,
                                         std::vector<std::string>& warnings) {
    const std::vector<double>& z = ws.sweep.z;
    const std::span<const std::size_t> used(ws.used);
    std::vector<profile_point> out;
    const std::size_t n = used.size();
    out.reserve(n);
    if (n == 0) return out;
    std::vector<double> x(n), y(n);
    std::vector<long double> zsum(n + 1, 0.0L);  // prefix sums for the window centres
    for (std::size_t k = 0; k < n; ++k) {
        x[k] = z[used[k]];
        y[k] = ws.sweep.ln_abs_current[used[k]];  // in double, as fit_line receives it
        zsum[k + 1] = zsum[k] + z[used[k]];
    }
    detail::sliding_line line(std::move(x), std::move(y), ws.weights);
    auto one = [&](std::size_t begin, std::size_t end) {
        line.move_to(begin, end);
        // A window whose points share one z (repeated piezo steps) has no slope: skip it rather
        // than report an infinite one.
        if (!(z[used[end - 1]] > z[used[begin]])) return;
        double slope = 0.0, slope_stderr = 0.0;
        line.fit(begin, end, slope, slope_stderr);
        profile_point p;
        p.z_m = static_cast<double>((zsum[end] - zsum[begin]) / static_cast<long double>(end - begin));
        p.gap_m = contact.kind != contact_kind::none ? p.z_m + contact.gap_offset_m
                                                     : std::numeric_limits<double>::quiet_NaN();
        p.decay_constant_per_m = -0.5 * slope;
        p.decay_constant_stderr_per_m = 0.5 * slope_stderr;
        p.apparent_barrier_J = apparent_barrier_from_decay(p.decay_constant_per_m);
        p.apparent_barrier_stderr_J = p.decay_constant_per_m != 0.0
                                          ? 2.0 * p.apparent_barrier_J * p.decay_constant_stderr_per_m /
                                                std::abs(p.decay_constant_per_m)
                                          : 0.0;
        p.points = end - begin;
        out.push_back(p);
    };
    if (opt.window_points == 0 && opt.window_m > 0.0) {
        for (std::size_t b = 0, e = 0; b < n; ++b) {
            e = std::max(e, b);
            while (e < n && z[used[e]] <= z[used[b]] + opt.window_m) ++e;
            if (e - b >= min_window_points) one(b, e);
            if (e == n) break;
        }
        if (out.empty()) warnings.push_back(fmt::format("no profile: a {:.3g} nm window holds fewer than {} used points",
                                                        opt.window_m / 1e-9, min_window_points));
        return out;
    }
    const std::size_t window = opt.window_points > 0 ? opt.window_points : std::max(default_window_min, n / 5);
    if (window > n) {
        warnings.push_back(fmt::format("no profile: the window of {} points is longer than the {} points used", window, n));
        return out;
    }
    for (std::size_t b = 0; b + window <= n; ++b) one(b, b + window);
    return out;
}

// fit_sweep's input errors for a linear selection that did not give a line.
void throw_unless_fitted(detail::linear_status status, const fit_workspace& ws, const detail::point_selection& sel,
                         const location& where) {
    const std::vector<std::size_t>& used = ws.used;
    switch (status) {
        case detail::linear_status::fitted: return;
        case detail::linear_status::too_few_points:
            throw_input(where, fmt::format("only {} of {} points lie above the noise floor of {}{}{}; a fit needs at "
                                           "least 3",
                                           used.size(), ws.sweep.z.size(), detail::format_current(sel.noise_floor_A),
                                           sel.saturation_A > 0.0 ? " and below the saturation at " : "",
                                           sel.saturation_A > 0.0 ? detail::format_current(sel.saturation_A) : ""));
        case detail::linear_status::no_spread_in_z:
            throw_input(where, fmt::format("all {} points used for the fit have the same z ({:g} nm); expected a curve "
                                           "over a range of z",
                                           used.size(), ws.sweep.z[used.front()] / 1e-9));
        case detail::linear_status::singular:
            throw_input(where, fmt::format("the straight-line fit of ln|I| against z over {} points is singular; "
                                           "expected points that spread over z with comparable currents",
                                           used.size()));
    }
}

// Warnings a careful reader wants next to the numbers: saturation, contact, a short current
// range, a decay constant of the wrong sign.
void add_warnings(fit_result& r, const fit_options& opt) {
    if (r.saturation_detected) {
        r.warnings.push_back(fmt::format("flat top detected: {} points at or above {} treated as saturated and not used",
                                         r.points_saturated, detail::format_current(r.saturation_A)));
    } else if (r.points_saturated > 0) {
        r.warnings.push_back(fmt::format("{} points at or above the saturation of {} were not used", r.points_saturated,
                                         detail::format_current(r.saturation_A)));
    }
    if (r.contact.kind != contact_kind::none) {
        r.warnings.push_back(fmt::format(
            "point contact ({}) at z = {:.4g} nm{}: {} close-end points not used; gap = z {} {:.4g} nm for a "
            "contact distance of {:.3g} nm",
            to_string(r.contact.kind), r.contact.z_m / 1e-9,
            std::isfinite(r.contact.conductance_G0) ? fmt::format(" (G = {:.3g} G0)", r.contact.conductance_G0)
                                                    : std::string(" (no bias in the metadata, conductance unknown)"),
            r.contact.points_in_contact, r.contact.gap_offset_m < 0 ? "-" : "+", std::abs(r.contact.gap_offset_m) / 1e-9,
            opt.contact_distance_m / 1e-9));
    }
    if (r.current_decades_used < 1.0) {
        r.warnings.push_back(
            fmt::format("the used points span only {:.2g} decades of current; the decay constant is poorly constrained",
                        r.current_decades_used));
    }
    // κ = 2-20 /nm (φ_ap about 0.15-15 eV) spans clean metal junctions in vacuum down to
    // adsorbate-covered or wet ones (common practice, no source); outside it, suspect the data.
    const double kappa_nm = r.decay_constant_per_m * 1e-9;
    if (kappa_nm > 0.0 && (kappa_nm < 2.0 || kappa_nm > 20.0)) {
        r.warnings.push_back(fmt::format("decay constant {:.3g} /nm (phi_ap {:.3g} eV) is outside the usual 2-20 /nm: check "
                                         "the z calibration and units, the offset and the noise",
                                         kappa_nm, r.apparent_barrier_J / si::electron_volt));
    }
    if (r.decay_constant_per_m <= 0.0) {
        r.warnings.push_back("|I| does not decrease with z (decay constant <= 0): check that z increases as the tip "
                             "retracts");
    }
}

}  // namespace

fit_result fit_sweep(const curve_sweep& sweep, double bias_V, const fit_options& opt, const location& where) {
    opt.validate();
    const std::size_t n = sweep.z_m.size();
    if (n < 3) throw_input(where, fmt::format("the sweep has only {} points; a fit needs at least 3", n));

    fit_result r;
    r.model = opt.model;
    r.direction = sweep.direction;
    r.points_total = n;
    r.confidence_level = opt.confidence_level;
    r.calibration_uncertainty = opt.calibration_uncertainty;

    // The selection of fit_sweep_fast, on the sweep sorted by z (closest first).
    fit_workspace ws;
    ws.sweep.assign(sweep.z_m, sweep.current_A);
    const detail::point_selection selection = detail::select_points(ws, bias_V, opt);
    selection.record(r);
    if (selection.noiseless) {
        r.warnings.push_back("the far tail shows no current noise; the weights assume a noise of 1e-9 of the "
                             "maximum current");
    }
    // The linear model (also the starting point of the offset model).
    const detail::linear_points linear = detail::fit_linear_points(ws, selection, svd_line);
    throw_unless_fitted(linear.status, ws, selection, where);
    r.z_ref_m = ws.sweep.z[ws.used.front()];
    r.line = linear.line;
    for (std::size_t i : ws.used) r.used_rows.push_back(ws.sweep.order[i]);

    if (opt.model == fit_model::linear) {
        detail::record_linear_fit(r, ws, linear.line);
        if (r.points_below_floor > 0) {
            r.warnings.push_back(fmt::format("{} of {} points lie below the noise floor of {} and were not used",
                                             r.points_below_floor, n, detail::format_current(r.noise_floor_A)));
        }
    } else {
        // The offset model uses every point outside contact and saturation. On a sweep that does
        // not determine its three parameters (a few scattered points: the covariance is singular)
        // the linear model's result is reported instead, with a warning.
        fit_result trial = r;
        detail::record_offset_fit(trial, ws, selection, linear.line, opt, where);
        if (std::isfinite(trial.decay_constant_per_m) && std::isfinite(trial.decay_constant_stderr_per_m) &&
            std::isfinite(trial.offset_stderr_A)) {
            r = std::move(trial);
            r.current_decades_used = detail::current_decades(ws);
        } else {
            detail::record_linear_fit(r, ws, linear.line);
            r.model = fit_model::linear;
            r.warnings.push_back("the offset model is undetermined on this sweep (singular covariance): the linear "
                                 "model's result is reported");
        }
    }
    add_warnings(r, opt);
    r.profile = local_profile(ws, opt, r.contact, r.warnings);
    return r;
}

std::vector<fit_result> fit_curve(const measured_curve& curve, const fit_options& options) {
    std::vector<fit_result> out;
    const double bias = curve.metadata.bias_V ? *curve.metadata.bias_V : std::numeric_limits<double>::quiet_NaN();
    for (const curve_sweep& s : curve.sweeps) {
        location where{curve.file, 0, 0, ""};
        if (curve.sweeps.size() > 1) where.key = fmt::format("{} sweep from row {}", to_string(s.direction), s.first_row + 1);
        out.push_back(fit_sweep(s, bias, options, where));
        // A decay constant <= 0 is no result to report. The readers refuse curves whose current
        // clearly rises with z (io/orientation.hpp); this catches the rest (noise, a sweep too short).
        if (!(out.back().decay_constant_per_m > 0.0)) {
            throw_input(where, fmt::format("|I| does not fall with z (fitted decay constant {:.3g} /nm): no barrier height "
                                           "can be given; z must grow as the tip retracts (if it grows as the tip "
                                           "approaches, read the file with --flip-z)",
                                           out.back().decay_constant_per_m * 1e-9));
        }
    }
    return out;
}

}  // namespace tipgap
