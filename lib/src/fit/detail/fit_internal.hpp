#pragma once
// Internals shared by the fit_*.cpp files.
#include <cstddef>
#include <span>
#include <string>
#include <vector>

#include "tipgap/fit/fit.hpp"

namespace tipgap::detail {

// Median of a copy of the values (n >= 1).
double median(std::vector<double> v);
// Median of the values, reordering them in place (n >= 1); the same value as median().
double median_in_place(std::span<double> v);
// Median absolute deviation about the median (n >= 1).
double mad(const std::vector<double>& v);
// The median of v and the median of |v - median|, bit for bit those of median_in_place applied
// twice, from one sort of v (in place, n >= 1): the deviations of the sorted values below and above
// the median are each ordered, so their median is found by merging the two runs.
struct median_mad {
    double median;
    double mad;  // unscaled
};
median_mad median_and_mad(std::span<double> v);

// Noise estimate from the far tail of a sweep given farthest point first (see estimate_noise).
// current_far_first: the sweep's currents ordered by decreasing z, n >= 3; scratch: reused buffer.
noise_estimate noise_from_far_first(std::span<const double> current_far_first, std::vector<double>& scratch);

// Constants of the linear-model point selection (point_selection.hpp), which fit_sweep and
// fit_sweep_fast share.
// Without measurable noise (exact synthetic data) the weights still need a σ_I; a tiny fraction
// of the maximum keeps their shape |I|² without affecting anything else.
inline constexpr double noiseless_sigma_fraction = 1e-9;
// Reweighting passes of the linear fit (weights and selection from the fitted current, which
// removes the bias of selecting and weighting by the noisy observed current); 3 is ample since the
// selection settles after the second.
inline constexpr int linear_passes = 3;
// In the reweighted passes a point must still show at least a third of the floor: at the cut
// (fitted |I| = floor = 3σ) this drops only 2σ downward fluctuations, whose logarithm would be
// wild.
inline constexpr double observed_floor_fraction = 1.0 / 3.0;

// Student t quantile for a two-sided interval at `confidence_level` with `dof` degrees of freedom
// (remembered per thread for whole dof, so that many curves and pixels compute each once).
double t_quantile(double dof, double confidence_level);
// Fills the decay-constant and barrier fields of `r` from κ (1/m), its statistical standard error
// (1/m) and the degrees of freedom; r.calibration_uncertainty and r.confidence_level must be set.
// t: the t quantile for dof at r.confidence_level (from t_quantile).
void fill_decay(fit_result& r, double kappa, double kappa_stat_se, double dof, double t);

// "2.00 pA", "1.50 nA": a current for messages, 3 significant digits.
std::string format_current(double current_A);

// Flat top of repeated near-equal maxima: returns the level at and above which points are
// saturated, or 0 when there is no flat top. abs_current: |I| of the sweep; noise_A: σ_I.
double detect_saturation(std::span<const double> abs_current, double noise_A);

// Finds a jump to contact or a conductance plateau at the close end. z_m ascending; abs_current
// matching; floor_A: noise floor; bias_V: V or NaN; contact_distance_m: m.
contact_result detect_contact(std::span<const double> z_m, std::span<const double> abs_current, double floor_A,
                              double bias_V, double contact_distance_m);

// Offset-model fit y = a exp(-b (z - z_ref) - q (z - z_ref)²) + c on (z_m, signed current), q
// only when `quadratic` (the curvature test), started from (a0, b0, c0, q = 0).
struct offset_problem {
    std::span<const double> z_m;               // m, n >= 4
    std::span<const double> signed_current_A;  // A, the same length
    std::span<const double> weights;           // 1/σ² (A⁻²), the same length; empty = equal weights
    double z_ref_m = 0.0;
    double a0_A = 0.0, b0_per_m = 0.0, c0_A = 0.0;
    int max_evaluations = 2000;
    bool quadratic = false;
    // c held at c0_A (only a and b fitted; not with quadratic): the offset is known, not estimated.
    bool fixed_offset = false;
};
struct offset_fit {
    double amplitude_A = 0.0, amplitude_stderr_A = 0.0;
    double rate_per_m = 0.0, rate_stderr_per_m = 0.0;  // b = 2κ
    double offset_A = 0.0, offset_stderr_A = 0.0;
    double curvature_per_m2 = 0.0, curvature_stderr_per_m2 = 0.0;  // q (quadratic only)
    // Without weights: the sum of squared residuals (A²), covariance scaled by SSR/(n - p).
    // With weights: χ² = Σ w r², covariance absolute (the weights are 1/σ² of a noise model).
    double ssr = 0.0;
    std::vector<double> leverage;  // diagonal of the (weighted) hat matrix, per point, in [0, 1]
    std::vector<double> covariance;  // of (a [A], b [1/m], c [A]), row-major 3x3
    int evaluations = 0;
    bool converged = false;
    std::string message;
};
offset_fit fit_offset_model(const offset_problem& problem);

// The noise model σ² = σ_I² + (ε μ)² of the offset fit (noise_model.cpp).
struct noise_model {
    double current_noise_A = 0.0;  // σ_I, A
    double relative_noise = 0.0;   // ε, dimensionless
    double variance(double mean_A) const {
        return current_noise_A * current_noise_A + relative_noise * relative_noise * mean_A * mean_A;
    }
};
// Maximum-likelihood estimate of (σ_I, ε) from the Gasser-Sroka-Jennen-Steinmetz pseudo-residuals
// of the residuals r (A) of the current fit, with μ (A) the fitted exponential part, at ascending
// z (m); the three have the same length n >= 3. fixed_current_noise_A > 0 holds σ_I at that value.
// min_current_noise_A > 0 keeps σ_I away from 0 on noiseless data.
noise_model estimate_noise_model(std::span<const double> z_m, std::span<const double> residual_A,
                                 std::span<const double> mean_A, double fixed_current_noise_A,
                                 double min_current_noise_A);

}  // namespace tipgap::detail
