#pragma once
// Apparent barrier height and decay constant from measured I(z) curves.
//
// In the planar tunnelling picture I ∝ exp(-2 κ z) with κ = sqrt(2 m φ)/ħ, so the slope of ln|I|
// against z gives the decay constant κ and the apparent barrier height
//   φ_ap = (ħ²/8m) (d ln|I|/dz)² = ħ² κ² / (2m)
// (Binnig, Rohrer, Gerber, Weibel, Appl. Phys. Lett. 40, 178 (1982); Chen, Introduction to Scanning
// Tunneling Microscopy, 2nd ed. (2008), eq. 1.9).
#include <cstddef>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "tipgap/io/curve_io.hpp"
#include "tipgap/core/enum_names.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap {

// ---------------------------------------------------------------------------------------------
// Building block: weighted straight-line least squares y = intercept + slope x, solved by SVD of
// the weighted design matrix (no normal equations), with the covariance scaled by the residual
// variance, s² = Σ w r² / (n - 2) (as scipy.optimize.curve_fit with absolute_sigma=False).
struct line_fit {
    double intercept = 0.0;
    double slope = 0.0;
    double intercept_stderr = 0.0;
    double slope_stderr = 0.0;
    double covariance = 0.0;          // cov(intercept, slope)
    double residual_std = 0.0;        // s = sqrt(Σ w r² / (n - 2)) (in y units when w = 1)
    double r_squared = 0.0;           // 1 - Σ w r² / Σ w (y - ȳ_w)²
    double residual_rms = 0.0;        // sqrt(Σ r² / n), unweighted
    std::size_t points = 0;
};

// x, y: same length >= 3, finite. weights: empty (all 1) or the same length, each > 0 (1/σ²).
line_fit fit_line(std::span<const double> x, std::span<const double> y, std::span<const double> weights = {});

// ---------------------------------------------------------------------------------------------
enum class fit_model {
    linear,  // weighted linear least squares of ln|I| against z
    offset,  // I = I0 exp(-2 κ (z - z_ref)) + c by weighted nonlinear least squares (Levenberg-
             // Marquardt), weights from the noise model σ² = σ_I² + (ε μ)² estimated with the fit
};
template <>
struct enum_names<fit_model> {
    static constexpr enum_name<fit_model> table[] = {{fit_model::linear, "linear"}, {fit_model::offset, "offset"}};
};

struct fit_options {
    // The default: the offset and the noise model are estimated with κ (honest intervals with an
    // amplifier offset and gap jitter); linear is faster and kept for maps.
    fit_model model = fit_model::offset;
    // Current below which a point is noise (A, >= 0; 0 = estimate from the far tail, see
    // estimate_noise). Points with |I| below it are not used by the linear model.
    double noise_floor_A = 0.0;
    // Amplifier saturation (A, >= 0; 0 = detect a flat top). Points with |I| at or above it are
    // not used by either model.
    double saturation_A = 0.0;
    // Standard deviation of the current noise (A, >= 0; 0 = estimate). Sets the weights of the
    // linear fit, σ_lnI = σ_I/|I|, and holds σ_I of the offset model's noise model.
    double current_noise_A = 0.0;
    // Relative piezo calibration uncertainty u (dimensionless, [0, 0.5)). z_true = z (1 ± u), so κ
    // carries a relative uncertainty u and φ_ap 2u, added in quadrature to the statistical error.
    double calibration_uncertainty = 0.0;
    // Confidence level of the reported intervals ([0.5, 0.9999], default 0.95).
    double confidence_level = 0.95;
    // Sliding-window profile φ_ap(z): window in points (>= 4; 0 = use window_m or the default
    // max(8, n_used/5)), or in length (m, > 0; used when window_points is 0).
    std::size_t window_points = 0;
    double window_m = 0.0;
    // Tip-sample distance at the point of contact, used to put an absolute gap scale on z
    // (m, > 0; 0.25 nm is common practice, no source).
    double contact_distance_m = 0.25e-9;
    // Levenberg-Marquardt iteration limit for the offset model (function evaluations, >= 10).
    int max_evaluations = 2000;

    // Throws tipgap::error (input, naming the field) when a value is out of range.
    void validate() const;
};

// How the noise level of a sweep was obtained (see estimate_noise for the rules).
struct noise_estimate {
    double noise_floor_A = 0.0;     // threshold |I| below which points are noise
    double current_noise_A = 0.0;   // σ_I
    double tail_offset_A = 0.0;     // median current of the far tail (signed)
    bool floor_reached = false;     // the far tail is flat: the curve has reached its noise floor
};

// Estimates the current noise and the noise floor of one sweep from its far tail (largest z).
//   tail          = the farthest max(8, n/5) points (at most n/2)
//   σ_I           = 1.4826 · MAD(ΔI_tail) / √2   (first differences cancel the slow decay; the MAD
//                   rejects outliers; 1.4826 makes the MAD a Gaussian σ)
//   floor reached  when the tail's own robust spread 1.4826 · MAD(I_tail) is below 2 σ_I, i.e. the
//                   tail shows no decay beyond its noise
//   noise floor   = |median(I_tail)| + 3 σ_I when the floor is reached, otherwise 3 σ_I
// z_m, current_A: same length >= 3 (any order).
noise_estimate estimate_noise(std::span<const double> z_m, std::span<const double> current_A);

struct profile_point {
    double z_m = 0.0;                       // window centre (mean z of its points), m
    double gap_m = 0.0;                     // absolute gap at z_m when a contact was found, else NaN
    double decay_constant_per_m = 0.0;      // κ in the window, 1/m
    double decay_constant_stderr_per_m = 0.0;
    double apparent_barrier_J = 0.0;        // φ_ap in the window, J
    double apparent_barrier_stderr_J = 0.0;
    std::size_t points = 0;
};

enum class contact_kind { none, jump, plateau };
template <>
struct enum_names<contact_kind> {
    static constexpr enum_name<contact_kind> table[] = {
        {contact_kind::none, "none"}, {contact_kind::jump, "jump"}, {contact_kind::plateau, "plateau"}};
};

struct contact_result {
    contact_kind kind = contact_kind::none;
    double z_m = 0.0;             // z at which contact forms: midpoint between the last contact
                                  // point and the first tunnelling point, m
    double conductance_G0 = 0.0;  // conductance on the contact side in units of G0 = 2e²/h (NaN
                                  // without a bias in the metadata)
    double gap_offset_m = 0.0;    // gap = z + gap_offset_m, i.e. contact_distance - z_contact, m
    std::size_t points_in_contact = 0;  // close-end points excluded from the fit
};

enum class fit_status {
    converged,      // the fit finished normally
    not_converged,  // the offset model hit its iteration limit or stalled; values are the last iterate
};
template <>
struct enum_names<fit_status> {
    static constexpr enum_name<fit_status> table[] = {{fit_status::converged, "converged"},
                                                      {fit_status::not_converged, "not_converged"}};
};

struct fit_result {
    // The default: the offset and the noise model are estimated with κ (honest intervals with an
    // amplifier offset and gap jitter); linear is faster and kept for maps.
    fit_model model = fit_model::offset;
    sweep_direction direction = sweep_direction::unknown;
    fit_status status = fit_status::converged;
    std::string message;
    int iterations = 0;

    double decay_constant_per_m = 0.0;            // κ, 1/m
    double decay_constant_stderr_per_m = 0.0;     // standard error incl. calibration, 1/m
    double decay_constant_stat_stderr_per_m = 0.0;  // statistical part only, 1/m
    double decay_constant_ci_low_per_m = 0.0;     // confidence interval, 1/m
    double decay_constant_ci_high_per_m = 0.0;
    double apparent_barrier_J = 0.0;              // φ_ap = ħ²κ²/(2m), J
    double apparent_barrier_stderr_J = 0.0;       // 2 φ σ_κ/κ, J
    double apparent_barrier_ci_low_J = 0.0;       // φ_ap at the ends of the κ interval, J
    double apparent_barrier_ci_high_J = 0.0;
    double length_per_decade_m = 0.0;             // ln 10 / (2κ), m
    double prefactor_A = 0.0;                     // fitted |I| at z_ref (excluding the offset), A
    double prefactor_stderr_A = 0.0;              // A
    double z_ref_m = 0.0;                         // reference z of the prefactor (closest used point), m
    double offset_A = 0.0;                        // c of the offset model (0 for linear), A (signed
                                                  // like the current)
    double offset_stderr_A = 0.0;
    double r_squared = 0.0;                       // linear: weighted, of ln|I|; offset: of I
    double residual_rms_ln = 0.0;                 // RMS of ln|I| - ln|model| over the used points
    double residual_rms_A = 0.0;                  // RMS of I - model over the used points, A
    double reduced_chi_square = 0.0;              // Σ w r² / dof against the noise model, ≈ 1 when
                                                  // it holds (linear: w = (I_fit/σ_I)² on ln|I|;
                                                  // offset: w = 1/(σ_I² + (ε μ)²) on I)
    double relative_noise = 0.0;                  // ε of the offset model's noise model (0 for linear)
    double curvature_p_value = 1.0;               // offset: F test of a quadratic term in the
                                                  // exponent (small: ln|I - c| is curved); linear: 1
    double current_decades_used = 0.0;            // log10(max |I| / min |I|) over the used points
    double degrees_of_freedom = 0.0;              // points used - parameters
    double t_quantile = 0.0;                      // Student t quantile used for the intervals
    double confidence_level = 0.95;
    double calibration_uncertainty = 0.0;

    std::size_t points_total = 0;
    std::size_t points_used = 0;
    std::size_t points_below_floor = 0;  // outside contact, with |I| below the floor (unused by linear)
    std::size_t points_saturated = 0;

    double noise_floor_A = 0.0;          // threshold used, A
    bool noise_floor_estimated = false;
    double current_noise_A = 0.0;        // σ_I used for the weights (offset: of the noise model), A
    bool current_noise_estimated = false;
    double saturation_A = 0.0;           // saturation level used (0 = none), A
    bool saturation_detected = false;

    contact_result contact;
    std::vector<profile_point> profile;
    // The points the model used, as indices into the sweep's z_m/current_A, in ascending z.
    std::vector<std::size_t> used_rows;
    // Offset model: the covariance of (I0 [A], 2κ [1/m], c [A]) as a row-major 3x3 matrix (with
    // the same Birge scaling as the errors, signs as fitted: c with the sign of the signal), for
    // the confidence band of the fitted current in plots; empty for the linear model.
    std::vector<double> parameter_covariance;
    // The weighted line ln|I| = intercept + slope z of the linear model over the used points
    // (statistical covariance, no calibration); for the offset model, its linear starting fit.
    // Gives the confidence band of the fitted ln|I| in plots.
    line_fit line;
    std::vector<std::string> warnings;
};

// Fits one sweep. bias_V (V, may be NaN when unknown) is needed for contact conductance.
// `where` names the file in errors. Throws tipgap::error (input) when fewer than 3 points remain
// above the noise floor and below saturation (linear) or fewer than 4 below saturation (offset).
fit_result fit_sweep(const curve_sweep& sweep, double bias_V, const fit_options& options,
                     const location& where = {});

// Fits every sweep of a curve (approach and retract separately), in file order.
std::vector<fit_result> fit_curve(const measured_curve& curve, const fit_options& options);

// φ_ap in J for a decay constant κ in 1/m (ħ²κ²/2m, CODATA 2018 constants).
double apparent_barrier_from_decay(double decay_constant_per_m);

}  // namespace tipgap
