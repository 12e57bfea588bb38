// The default fit of one sweep: I = I0 exp(-2κ (z - z_ref)) + c by weighted nonlinear least
// squares over every usable point, weighted by the noise model σ² = σ_I² + (ε μ)², whose two
// parameters are re-estimated from the residuals after each pass (noise_model.cpp). The offset c
// and its standard error come from the same covariance as κ, so its uncertainty is carried into κ
// and φ_ap. Then goodness of fit: χ²/dof against the noise model and a curvature test.
#include <algorithm>
#include <boost/math/distributions/fisher_f.hpp>
#include <cmath>
#include <fmt/format.h>
#include <limits>
#include <string>

#include "fit/detail/point_selection.hpp"

namespace tipgap::detail {
namespace {

// Passes of fit + noise re-estimate; the noise parameters settle to < 1e-3 relative in 3-5 on
// synthetic curves (white, offset, jitter), 8 is ample.
constexpr int noise_passes = 8;
constexpr double noise_tolerance = 1e-3;
// Reweighting with the final noise model converges linearly with a small rate (the weights depend
// on the parameters only through μ); 1e-12 is reached in 2-4 passes.
constexpr int reweight_passes = 10;
constexpr double reweight_tolerance = 1e-12;
// Level of the curvature test: at 1e-3 one honest curve in a thousand warns (common practice, no
// source).
constexpr double curvature_level = 1e-3;

struct offset_data {
    std::vector<double> z, y;  // ascending z; y = s · I, so that the exponential is positive
    double sign = 1.0;
};

offset_data usable_points(fit_result& r, const fit_workspace& ws, const point_selection& sel) {
    const sorted_sweep& sw = ws.sweep;
    offset_data d;
    double sign_sum = 0.0;
    r.used_rows.clear();
    for (std::size_t i = 0; i < sw.z.size(); ++i) {
        if (!sel.usable_by_offset(i, sw.abs_current[i])) continue;
        r.used_rows.push_back(sw.order[i]);
        d.z.push_back(sw.z[i]);
        d.y.push_back(sw.current[i]);
        sign_sum += sw.current[i];
    }
    d.sign = sign_sum < 0.0 ? -1.0 : 1.0;
    for (double& v : d.y) v *= d.sign;
    return d;
}

double exponential_part(const offset_fit& of, double x) { return of.amplitude_A * std::exp(-of.rate_per_m * x); }

// The weights 1/σ² of the noise model at the fitted exponential; false (and w unchanged) when one
// is not finite, so that w always holds the weights of the last weighted fit.
bool noise_weights(const offset_data& d, double z_ref, const offset_fit& of, const noise_model& nm, std::vector<double>& w) {
    std::vector<double> next(d.z.size());
    for (std::size_t k = 0; k < d.z.size(); ++k) {
        next[k] = 1.0 / nm.variance(exponential_part(of, d.z[k] - z_ref));
        if (!std::isfinite(next[k]) || !(next[k] > 0.0)) return false;
    }
    w.swap(next);
    return true;
}

// Alternates the weighted fit and the noise estimate until the noise model settles.
offset_fit iterate_noise(offset_problem pb, offset_fit of, const offset_data& d, const fit_options& opt,
                         noise_model& nm, std::vector<double>& w) {
    const double sigma_min = noiseless_sigma_fraction * std::abs(pb.a0_A);
    std::vector<double> res(d.z.size()), mu(d.z.size());
    for (int pass = 0; pass < noise_passes; ++pass) {
        if (!noise_weights(d, pb.z_ref_m, of, nm, w)) break;
        pb.weights = w;
        pb.a0_A = of.amplitude_A;
        pb.b0_per_m = of.rate_per_m;
        pb.c0_A = of.offset_A;
        of = fit_offset_model(pb);
        for (std::size_t k = 0; k < d.z.size(); ++k) {
            mu[k] = exponential_part(of, d.z[k] - pb.z_ref_m);
            // Studentized: a fitted residual has variance σ² (1 - h), which matters for short
            // curves (16 points, 3 parameters: 19 % on average).
            res[k] = (d.y[k] - mu[k] - of.offset_A) / std::sqrt(std::max(1.0 - of.leverage[k], 1e-3));
        }
        const noise_model next = estimate_noise_model(d.z, res, mu, opt.current_noise_A, std::max(sigma_min, 1e-300));
        const bool settled = std::abs(next.current_noise_A - nm.current_noise_A) <= noise_tolerance * nm.current_noise_A &&
                             std::abs(next.relative_noise - nm.relative_noise) <=
                                 noise_tolerance * std::max(nm.relative_noise, 1e-6);
        nm = next;
        if (settled) break;
    }
    // The last fits with the final noise model, reweighted until the weights are those of the
    // solution itself (a fixed point: the parameters minimise Σ (I - m)²/σ²(μ) with μ their own
    // exponential), so that the covariance is the model's and the fit can be reproduced.
    for (int pass = 0; pass < reweight_passes && noise_weights(d, pb.z_ref_m, of, nm, w); ++pass) {
        pb.weights = w;
        pb.a0_A = of.amplitude_A;
        pb.b0_per_m = of.rate_per_m;
        pb.c0_A = of.offset_A;
        const double rate = of.rate_per_m;
        of = fit_offset_model(pb);
        if (std::abs(of.rate_per_m - rate) <= reweight_tolerance * std::abs(rate)) break;
    }
    return of;
}

// F test of the quadratic term q (z - z_ref)² in the exponent with the same weights: ln|I - c| is
// not a straight line when p is small.
double curvature_p_value(offset_problem pb, const offset_fit& of, std::span<const double> w) {
    const double n = static_cast<double>(pb.z_m.size());
    if (n < 6.0 || w.empty()) return 1.0;
    pb.weights = w;
    pb.quadratic = true;
    pb.a0_A = of.amplitude_A;
    pb.b0_per_m = of.rate_per_m;
    pb.c0_A = of.offset_A;
    const offset_fit q = fit_offset_model(pb);
    if (!(q.ssr < of.ssr) || !(q.ssr > 0.0)) return 1.0;
    const double f = (of.ssr - q.ssr) / (q.ssr / (n - 4.0));
    return boost::math::cdf(boost::math::complement(boost::math::fisher_f(1.0, n - 4.0), f));
}

void record_statistics(fit_result& r, const offset_data& d, const offset_fit& of, double z_ref) {
    double mean = 0.0;
    for (double v : d.y) mean += v;
    mean /= static_cast<double>(d.y.size());
    double sst = 0.0, ssr = 0.0, ss_ln = 0.0;
    std::size_t n_ln = 0;
    for (std::size_t k = 0; k < d.y.size(); ++k) {
        sst += (d.y[k] - mean) * (d.y[k] - mean);
        const double m = exponential_part(of, d.z[k] - z_ref) + of.offset_A;
        ssr += (d.y[k] - m) * (d.y[k] - m);
        if (d.y[k] > 0.0 && m > 0.0) {
            ss_ln += std::pow(std::log(d.y[k]) - std::log(m), 2);
            ++n_ln;
        }
    }
    r.r_squared = sst > 0.0 ? 1.0 - ssr / sst : 1.0;
    r.residual_rms_A = std::sqrt(ssr / static_cast<double>(d.y.size()));
    r.residual_rms_ln = n_ln > 0 ? std::sqrt(ss_ln / static_cast<double>(n_ln)) : 0.0;
}

// When ln|I - c| is curved (the WKB barrier with the image potential over a wide gap range), c is
// not separable from the curvature: the joint fit lets it absorb part of it, by many of its own
// standard errors (−3.3 ± 0.56 pA on a clean synthetic curve with no offset at 0.1 pA noise). c is
// then held at the far tail's median when the curve reaches a flat noise floor (a shape-free
// estimate; standard error √(π/2) σ_I/√n_tail, the large-sample error of a median, Kendall &
// Stuart, The Advanced Theory of Statistics, vol. 1), else at 0; a and b are refitted.
struct held_offset {
    bool held = false;
    bool at_tail = false;   // held at the tail's median (else at an assumed 0, stderr 0)
    double stderr_A = 0.0;
};

held_offset hold_offset(offset_problem& pb, offset_fit& of, const offset_data& d, const fit_options& opt,
                        const point_selection& sel, std::size_t points_total, noise_model& nm, std::vector<double>& w) {
    pb.fixed_offset = true;
    pb.c0_A = sel.noise.floor_reached ? d.sign * sel.noise.tail_offset_A : 0.0;
    pb.weights = {};
    pb.a0_A = of.amplitude_A;
    pb.b0_per_m = of.rate_per_m;
    of = iterate_noise(pb, fit_offset_model(pb), d, opt, nm, w);
    // The tail of estimate_noise: the farthest max(8, n/5) points, at most n/2.
    const double n = static_cast<double>(points_total);
    const double n_tail = std::max(1.0, std::min(std::max(8.0, std::floor(n / 5.0)), std::floor(n / 2.0)));
    const double se = std::sqrt(0.5 * std::acos(-1.0)) * sel.noise.current_noise_A / std::sqrt(n_tail);
    return {true, sel.noise.floor_reached, sel.noise.floor_reached ? se : 0.0};
}

std::string curvature_warning(double p_value, const held_offset& held, double offset_A) {
    std::string s = fmt::format("ln|I - offset| is not a straight line (curvature test p = {:.2g}): the barrier changes over "
                                "the gap; see the phi_ap(z) profile",
                                p_value);
    if (!held.held) return s;
    return s + (!held.at_tail
                    ? "; the offset cannot be told apart from this curvature and the curve reaches no flat noise floor, "
                      "so the offset is held at 0"
                    : fmt::format("; the offset cannot be told apart from this curvature, so it is held at the far "
                                  "tail's median, {:.3g} pA",
                                  offset_A * 1e12));
}

}  // namespace

void record_offset_fit(fit_result& r, const fit_workspace& ws, const point_selection& sel, const line_fit& line,
                       const fit_options& opt, const location& where) {
    const offset_data d = usable_points(r, ws, sel);
    if (d.z.size() < 4) {
        throw_input(where, fmt::format("only {} points lie below saturation and outside contact; the offset "
                                       "model needs at least 4",
                                       d.z.size()));
    }
    offset_problem pb{.z_m = d.z, .signed_current_A = d.y, .weights = {}, .z_ref_m = d.z.front()};
    pb.a0_A = std::exp(line.intercept + line.slope * pb.z_ref_m);
    pb.b0_per_m = -line.slope;
    pb.c0_A = sel.noise.floor_reached ? d.sign * sel.noise.tail_offset_A : 0.0;
    pb.max_evaluations = opt.max_evaluations;
    offset_fit of = fit_offset_model(pb);  // equal weights: the start of the weighted passes
    noise_model nm{sel.current_noise_A, 0.0};
    std::vector<double> w;
    of = iterate_noise(pb, of, d, opt, nm, w);
    const double curvature_p = curvature_p_value(pb, of, w);
    const held_offset held =
        curvature_p < curvature_level ? hold_offset(pb, of, d, opt, sel, r.points_total, nm, w) : held_offset{};

    // χ² against the noise model; when the curve scatters more than the model says (a curved
    // ln|I|, drift), the errors are scaled by the Birge ratio sqrt(χ²/dof) (Birge, Phys. Rev. 40,
    // 207 (1932); as scipy.optimize.curve_fit with absolute_sigma=False), never made smaller.
    const double dof = static_cast<double>(d.z.size()) - (held.held ? 2.0 : 3.0);
    r.reduced_chi_square = w.empty() ? 0.0 : of.ssr / dof;
    const double birge = std::sqrt(std::max(1.0, r.reduced_chi_square));
    of.amplitude_stderr_A *= birge;
    of.rate_stderr_per_m *= birge;
    of.offset_stderr_A *= birge;
    r.parameter_covariance = of.covariance;
    for (double& v : r.parameter_covariance) v *= birge * birge;
    r.z_ref_m = pb.z_ref_m;
    r.iterations = of.evaluations;
    r.status = of.converged ? fit_status::converged : fit_status::not_converged;
    r.message = of.message;
    if (!of.converged) r.warnings.push_back("the offset model did not converge: " + of.message);
    r.points_used = d.z.size();
    r.prefactor_A = of.amplitude_A;
    r.prefactor_stderr_A = of.amplitude_stderr_A;
    r.offset_A = d.sign * of.offset_A;
    r.offset_stderr_A = held.held ? held.stderr_A : of.offset_stderr_A;
    r.current_noise_A = nm.current_noise_A;
    r.relative_noise = nm.relative_noise;
    record_statistics(r, d, of, pb.z_ref_m);
    r.curvature_p_value = curvature_p;
    fill_decay(r, 0.5 * of.rate_per_m, 0.5 * of.rate_stderr_per_m, dof, t_quantile(dof, r.confidence_level));
    if (curvature_p < curvature_level) r.warnings.push_back(curvature_warning(curvature_p, held, r.offset_A));
}

}  // namespace tipgap::detail
