// Fitting one sweep: point selection (noise floor, saturation, contact), the linear or offset
// model, uncertainties with the piezo calibration folded in, and the local φ_ap(z) profile.
#include <algorithm>
#include <boost/math/distributions/students_t.hpp>
#include <cmath>
#include <fmt/format.h>
#include <limits>
#include <numeric>

#include "fit/detail/fit_internal.hpp"
#include "tipgap/core/constants.hpp"

namespace tipgap {

const char* to_string(fit_model m) {
    switch (m) {
        case fit_model::linear: return "linear";
        case fit_model::offset: return "offset";
    }
    return "linear";
}

bool from_string(std::string_view s, fit_model& out) {
    if (s == "linear") {
        out = fit_model::linear;
        return true;
    }
    if (s == "offset") {
        out = fit_model::offset;
        return true;
    }
    return false;
}

const char* to_string(contact_kind k) {
    switch (k) {
        case contact_kind::none: return "none";
        case contact_kind::jump: return "jump";
        case contact_kind::plateau: return "plateau";
    }
    return "none";
}

const char* to_string(fit_status s) { return s == fit_status::converged ? "converged" : "not_converged"; }

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
    if (!(confidence_level > 0.0 && confidence_level < 1.0))
        bad("confidence_level", fmt::format("{:g}", confidence_level), "a level in (0, 1), e.g. 0.95");
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

struct linear_outcome {
    line_fit line;
    std::vector<std::size_t> used;  // indices into the sorted sweep
    std::vector<double> weights;    // of the used points
};

// Weighted fit of ln|I| over the selected indices.
line_fit fit_ln(const std::vector<double>& z, const std::vector<double>& a, const std::vector<std::size_t>& idx,
                const std::vector<double>& w) {
    std::vector<double> x(idx.size()), y(idx.size());
    for (std::size_t k = 0; k < idx.size(); ++k) {
        x[k] = z[idx[k]];
        y[k] = std::log(a[idx[k]]);
    }
    return fit_line(x, y, w);
}

}  // namespace

double detail::t_quantile(double dof, double confidence_level) {
    boost::math::students_t dist(dof);
    return boost::math::quantile(dist, 0.5 + 0.5 * confidence_level);
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

// The weighted least-squares line of ln|I| on z over a sliding window, from running sums: O(1) per
// window instead of one SVD each. It is the line fit_line computes (the weighted least-squares line
// is unique): slope = Sxy / Sxx and var(slope) = SSR / ((n - 2) Sxx) with the centred weighted sums
// Sxx = Σw(x - x̄)², Sxy, Syy and SSR = Syy - Sxy Sxx⁻¹ Sxy (the weights' common scale cancels).
// The sums run in long double about an origin near the window (see move_to), so that the centred
// sums and the add-and-remove updates lose only a few of its 64 bits; where SSR cancels to below
// 1e-6 of Syy (a nearly exact line) it is summed from the residuals of the window instead.
// Agreement with the per-window SVD on 300 seeded curves when this was written: κ within 5e-14
// relative where the window resolves it (and within 1e-12 of its standard error where it does not),
// the standard errors within 4e-11 relative.
class sliding_line {
public:
    sliding_line(std::vector<long double> x, std::vector<long double> y, const std::vector<double>& w)
        : x_(std::move(x)), y_(std::move(y)), w_(w) {}

    // Moves the window to [b, e) (both ends only move forward). A removed term leaves the rounding
    // error of the larger sums it was part of, and raw second moments about a distant origin are
    // large next to the centred ones. So the sums are rebuilt about the window's first point once
    // the window has moved past the points of the last rebuild, or when the total weight (|I|²/σ²,
    // which can fall by decades along a sweep) has dropped below 1% of its peak: each point is then
    // added a bounded number of times, O(n) overall.
    void move_to(std::size_t b, std::size_t e) {
        while (end_ < e) add(end_++, 1);
        while (begin_ < b) add(begin_++, -1);
        peak_ = std::max(peak_, sw_);
        if (b >= rebuilt_end_ || sw_ < 1e-2L * peak_) {
            sw_ = sx_ = sy_ = sxx_ = sxy_ = syy_ = 0.0L;
            ox_ = x_[b];
            oy_ = y_[b];
            for (std::size_t k = b; k < e; ++k) add(k, 1);
            peak_ = sw_;
            rebuilt_end_ = e;
        }
    }

    // Slope and its standard error of the window [b, e) (whose sums are current).
    void fit(std::size_t b, std::size_t e, double& slope, double& slope_stderr) const {
        const long double mx = sx_ / sw_, my = sy_ / sw_;
        const long double sxx = sxx_ - sx_ * mx, sxy = sxy_ - sx_ * my, syy = syy_ - sy_ * my;
        const long double b1 = sxy / sxx;
        long double ssr = syy - b1 * sxy;
        if (!(ssr > 1e-6L * syy)) {
            ssr = 0.0L;
            for (std::size_t k = b; k < e; ++k) {
                const long double r = (y_[k] - oy_ - my) - b1 * (x_[k] - ox_ - mx);
                ssr += w_[k] * r * r;
            }
        }
        slope = static_cast<double>(b1);
        slope_stderr = static_cast<double>(std::sqrt(ssr / (static_cast<long double>(e - b) - 2.0L) / sxx));
    }

private:
    void add(std::size_t k, int sign) {
        const long double w = sign * static_cast<long double>(w_[k]), x = x_[k] - ox_, y = y_[k] - oy_;
        sw_ += w;
        sx_ += w * x;
        sy_ += w * y;
        sxx_ += w * x * x;
        sxy_ += w * x * y;
        syy_ += w * y * y;
    }

    std::vector<long double> x_, y_;
    const std::vector<double>& w_;
    std::size_t begin_ = 0, end_ = 0, rebuilt_end_ = 0;  // [begin_, end_): the points in the sums
    long double ox_ = 0, oy_ = 0;                         // origin of the sums
    long double sw_ = 0, sx_ = 0, sy_ = 0, sxx_ = 0, sxy_ = 0, syy_ = 0, peak_ = 0;
};

std::vector<profile_point> local_profile(const std::vector<double>& z, const std::vector<double>& a,
                                         const std::vector<std::size_t>& used, const std::vector<double>& w,
                                         const fit_options& opt, const contact_result& contact,
                                         std::vector<std::string>& warnings) {
    std::vector<profile_point> out;
    const std::size_t n = used.size();
    if (n == 0) return out;
    std::vector<long double> x(n), y(n), zsum(n + 1, 0.0L);  // zsum: prefix sums for the window centres
    for (std::size_t k = 0; k < n; ++k) {
        x[k] = z[used[k]];
        y[k] = std::log(a[used[k]]);  // in double, as fit_line receives it
        zsum[k + 1] = zsum[k] + z[used[k]];
    }
    sliding_line line(std::move(x), std::move(y), w);
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

}  // namespace

fit_result fit_sweep(const curve_sweep& sweep, double bias_V, const fit_options& opt, const location& where) {
    opt.validate();
    const std::size_t n = sweep.z_m.size();
    if (n < 3) throw_input(where, fmt::format("the sweep has only {} points; a fit needs at least 3", n));

    // Work on the sweep sorted by z (closest first); approach sweeps arrive reversed.
    std::vector<std::size_t> order(n);
    std::iota(order.begin(), order.end(), std::size_t{0});
    std::stable_sort(order.begin(), order.end(), [&](std::size_t i, std::size_t j) { return sweep.z_m[i] < sweep.z_m[j]; });
    std::vector<double> z(n), current(n), a(n);
    for (std::size_t k = 0; k < n; ++k) {
        z[k] = sweep.z_m[order[k]];
        current[k] = sweep.current_A[order[k]];
        a[k] = std::abs(current[k]);
    }
    const double a_max = *std::max_element(a.begin(), a.end());

    fit_result r;
    r.model = opt.model;
    r.direction = sweep.direction;
    r.points_total = n;
    r.confidence_level = opt.confidence_level;
    r.calibration_uncertainty = opt.calibration_uncertainty;

    const noise_estimate est = estimate_noise(z, current);
    r.current_noise_estimated = opt.current_noise_A <= 0.0;
    double sigma = r.current_noise_estimated ? est.current_noise_A : opt.current_noise_A;
    if (!(sigma > 0.0)) {
        sigma = detail::noiseless_sigma_fraction * a_max;
        r.warnings.push_back("the far tail shows no current noise; the weights assume a noise of 1e-9 of the "
                             "maximum current");
    }
    r.current_noise_A = sigma;
    r.noise_floor_estimated = opt.noise_floor_A <= 0.0;
    const double floor = r.noise_floor_estimated ? est.noise_floor_A : opt.noise_floor_A;
    r.noise_floor_A = floor;

    r.saturation_detected = false;
    double sat = opt.saturation_A;
    if (sat <= 0.0) {
        sat = detail::detect_saturation(a, sigma);
        r.saturation_detected = sat > 0.0;
    }
    r.saturation_A = sat;

    r.contact = detail::detect_contact(z, a, floor, bias_V, opt.contact_distance_m);
    const std::size_t first = r.contact.points_in_contact;
    // A conductance plateau is flat too: a "flat top" that lies wholly inside the contact is the
    // contact, not the amplifier.
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

    // Linear model (also the starting point of the offset model).
    std::vector<std::size_t> used;
    for (std::size_t i = 0; i < n; ++i) {
        if (eligible(i) && a[i] >= floor) used.push_back(i);
    }
    if (used.size() < 3) {
        throw_input(where, fmt::format("only {} of {} points lie above the noise floor of {}{}{}; a fit needs at "
                                       "least 3",
                                       used.size(), n, detail::format_current(floor),
                                       sat > 0.0 ? " and below the saturation at " : "",
                                       sat > 0.0 ? detail::format_current(sat) : ""));
    }
    // z is sorted, so the used points span [z[used.front()], z[used.back()]]. Without a spread in z
    // the slope of ln|I| is undefined (the least-squares problem is singular).
    if (!(z[used.back()] > z[used.front()])) {
        throw_input(where, fmt::format("all {} points used for the fit have the same z ({:g} nm); expected a curve "
                                       "over a range of z",
                                       used.size(), z[used.front()] / 1e-9));
    }
    // Weights (I/σ_I)², taken relative to the largest: fit_line scales the covariance by the
    // residual variance, so only ratios of weights matter, and ratios cannot overflow where
    // (I/σ_I)² can (a wild fitted line gives exp(...) near 1e308).
    auto relative_squares = [](std::vector<double> v) {
        const double ref = v.empty() ? 1.0 : *std::max_element(v.begin(), v.end());
        for (double& x : v) x = (x / ref) * (x / ref);
        return v;
    };
    std::vector<double> w(used.size());
    for (std::size_t k = 0; k < used.size(); ++k) w[k] = a[used[k]];
    w = relative_squares(std::move(w));
    line_fit line = fit_ln(z, a, used, w);
    for (int pass = 1; pass < detail::linear_passes; ++pass) {
        std::vector<std::size_t> next;
        std::vector<double> next_w;
        for (std::size_t i = 0; i < n; ++i) {
            const double fitted = std::exp(line.intercept + line.slope * z[i]);
            // An overflowing extrapolation of the line says nothing about the point's weight.
            if (!std::isfinite(fitted)) continue;
            if (eligible(i) && fitted >= floor && a[i] >= detail::observed_floor_fraction * floor) {
                next.push_back(i);
                next_w.push_back(fitted);
            }
        }
        next_w = relative_squares(std::move(next_w));
        if (next.size() < 3) break;
        const bool same = next == used;
        // A wild line (an outlier far out in z) can give weights that leave fewer than two
        // distinct z with any weight: the reweighted problem is then singular and its standard
        // errors NaN. Keep the last well-posed fit instead.
        const line_fit candidate = fit_ln(z, a, next, next_w);
        if (!std::isfinite(candidate.slope) || !std::isfinite(candidate.slope_stderr) ||
            !std::isfinite(candidate.intercept) || !std::isfinite(candidate.intercept_stderr)) {
            break;
        }
        used = std::move(next);
        w = std::move(next_w);
        line = candidate;
        if (same) break;
    }
    if (!std::isfinite(line.slope) || !std::isfinite(line.slope_stderr)) {
        throw_input(where, fmt::format("the straight-line fit of ln|I| against z over {} points is singular; expected "
                                       "points that spread over z with comparable currents",
                                       used.size()));
    }
    r.z_ref_m = z[used.front()];
    r.line = line;
    for (std::size_t i : used) r.used_rows.push_back(order[i]);

    if (opt.model == fit_model::linear) {
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
        double ss = 0.0;
        for (std::size_t i : used) {
            const double d = a[i] - std::exp(line.intercept + line.slope * z[i]);
            ss += d * d;
        }
        r.residual_rms_A = std::sqrt(ss / static_cast<double>(used.size()));
        const double dof = static_cast<double>(used.size()) - 2.0;
        r.reduced_chi_square = line.residual_std * line.residual_std;
        detail::fill_decay(r, -0.5 * line.slope, 0.5 * line.slope_stderr, dof, detail::t_quantile(dof, r.confidence_level));
        if (r.points_below_floor > 0) {
            r.warnings.push_back(fmt::format("{} of {} points lie below the noise floor of {} and were not used",
                                             r.points_below_floor, n, detail::format_current(floor)));
        }
    } else {
        std::vector<double> zz, yy;
        double sign_sum = 0.0;
        r.used_rows.clear();  // the offset model uses every point outside contact and saturation
        for (std::size_t i = 0; i < n; ++i) {
            if (i >= first && (sat <= 0.0 || a[i] < sat)) {
                r.used_rows.push_back(order[i]);
                zz.push_back(z[i]);
                yy.push_back(current[i]);
                sign_sum += current[i];
            }
        }
        if (zz.size() < 4) {
            throw_input(where, fmt::format("only {} points lie below saturation and outside contact; the offset "
                                           "model needs at least 4",
                                           zz.size()));
        }
        // Fit the current with the sign of the signal so that a is positive.
        const double s = sign_sum < 0.0 ? -1.0 : 1.0;
        for (double& v : yy) v *= s;
        const double z_ref = zz.front();
        const double a0 = std::exp(line.intercept + line.slope * z_ref);
        const double c0 = est.floor_reached ? s * est.tail_offset_A : 0.0;
        const detail::offset_fit of = detail::fit_offset_model(zz, yy, z_ref, a0, -line.slope, c0, opt.max_evaluations);
        r.z_ref_m = z_ref;
        r.iterations = of.evaluations;
        r.status = of.converged ? fit_status::converged : fit_status::not_converged;
        r.message = of.message;
        if (!of.converged) r.warnings.push_back("the offset model did not converge: " + of.message);
        r.points_used = zz.size();
        r.prefactor_A = of.amplitude_A;
        r.prefactor_stderr_A = of.amplitude_stderr_A;
        r.offset_A = s * of.offset_A;
        r.offset_stderr_A = of.offset_stderr_A;
        double mean = 0.0;
        for (double v : yy) mean += v;
        mean /= static_cast<double>(yy.size());
        double sst = 0.0, ss_ln = 0.0;
        std::size_t n_ln = 0;
        for (std::size_t k = 0; k < yy.size(); ++k) {
            sst += (yy[k] - mean) * (yy[k] - mean);
            const double m = of.amplitude_A * std::exp(-of.rate_per_m * (zz[k] - z_ref)) + of.offset_A;
            if (yy[k] > 0.0 && m > 0.0) {
                ss_ln += std::pow(std::log(yy[k]) - std::log(m), 2);
                ++n_ln;
            }
        }
        r.r_squared = sst > 0.0 ? 1.0 - of.ssr_A2 / sst : 1.0;
        r.residual_rms_A = std::sqrt(of.ssr_A2 / static_cast<double>(yy.size()));
        r.residual_rms_ln = n_ln > 0 ? std::sqrt(ss_ln / static_cast<double>(n_ln)) : 0.0;
        const double dof = static_cast<double>(zz.size()) - 3.0;
        detail::fill_decay(r, 0.5 * of.rate_per_m, 0.5 * of.rate_stderr_per_m, dof, detail::t_quantile(dof, r.confidence_level));
    }

    // Warnings a careful reader wants next to the numbers.
    if (r.saturation_detected) {
        r.warnings.push_back(fmt::format("flat top detected: {} points at or above {} treated as saturated and not used",
                                         r.points_saturated, detail::format_current(sat)));
    } else if (r.points_saturated > 0) {
        r.warnings.push_back(fmt::format("{} points at or above the saturation of {} were not used", r.points_saturated,
                                         detail::format_current(sat)));
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
    double lo = std::numeric_limits<double>::infinity(), hi = 0.0;
    for (std::size_t i : used) {
        lo = std::min(lo, a[i]);
        hi = std::max(hi, a[i]);
    }
    const double decades = std::log10(hi / lo);
    r.current_decades_used = decades;
    if (decades < 1.0) {
        r.warnings.push_back(
            fmt::format("the used points span only {:.2g} decades of current; the decay constant is poorly constrained",
                        decades));
    }
    if (r.decay_constant_per_m <= 0.0) {
        r.warnings.push_back("|I| does not decrease with z (decay constant <= 0): check that z increases as the tip "
                             "retracts");
    }

    r.profile = local_profile(z, a, used, w, opt, r.contact, r.warnings);
    return r;
}

std::vector<fit_result> fit_curve(const measured_curve& curve, const fit_options& options) {
    std::vector<fit_result> out;
    const double bias = curve.metadata.bias_V ? *curve.metadata.bias_V : std::numeric_limits<double>::quiet_NaN();
    for (const curve_sweep& s : curve.sweeps) {
        location where{curve.file, 0, 0, ""};
        if (curve.sweeps.size() > 1) where.key = fmt::format("{} sweep from row {}", to_string(s.direction), s.first_row + 1);
        out.push_back(fit_sweep(s, bias, options, where));
    }
    return out;
}

}  // namespace tipgap
