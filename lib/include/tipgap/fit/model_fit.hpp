#pragma once
// Model comparison: fit tipgap's tunnelling model (trapezoidal barrier with its image potential,
// WKB, Fermi-Dirac supply) to a measured I(z) sweep.
//
//   ln|I(z)| = a + ln|I_model(z + s0; φ̄, V)|
//
// Free parameters: the mean work function φ̄ (tip and sample shifted together, their difference
// held at the config's value), the absolute gap offset s0 (gap = z + s0) and a = ln of the area
// prefactor (I_data / I_model for the config's geometry). Weighted least squares on ln|I| over the
// points the linear fit used, weights (Î/σ_I)² from its fitted current Î, solved by
// Levenberg-Marquardt (Marquardt, J. SIAM 11, 431 (1963)) on Eigen. Each parameter set evaluates
// the model on a grid of gaps once and interpolates ln|I| with a cubic B-spline (Boost.Math), so a
// fit costs a few thousand model evaluations whatever the number of points.
//
// Why φ̄ and φ_ap differ: the image potential lowers and rounds the barrier, and the lowering
// shrinks as the gap grows, so d ln|I|/ds is smaller than 2 sqrt(2 m φ̄)/ħ: the apparent barrier
// height from the slope is below the mean work function (Binnig et al., Phys. Rev. B 30, 4816
// (1984); Lang, Phys. Rev. B 37, 10395 (1988) discuss how little φ_ap varies with s in spite of it).
#include <cstddef>
#include <limits>
#include <string>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/fit/fit.hpp"

namespace tipgap {

struct model_fit_options {
    int max_iterations = 60;             // Levenberg-Marquardt iterations, [5, 1000]
    std::size_t grid_points = 33;        // gaps per model evaluation grid, [8, 1000]
    double work_function_step_J = 0.01 * si::electron_volt;  // central-difference step in φ̄ (J), > 0
    // Starting gap offset (m); NaN: from a detected contact, else matched to the current with the
    // config's area.
    double initial_gap_offset_m = std::numeric_limits<double>::quiet_NaN();
    double confidence_level = 0.95;      // [0.5, 0.9999], for the t quantile of the reported intervals

    void validate() const;
};

struct model_fit_result {
    fit_status status = fit_status::converged;
    std::string message;
    int iterations = 0;
    int model_evaluations = 0;           // current evaluations (grid points × parameter sets)

    double mean_work_function_J = 0, mean_work_function_stderr_J = 0;
    double tip_work_function_J = 0, sample_work_function_J = 0;  // φ̄ ± half the held difference
    double gap_offset_m = 0, gap_offset_stderr_m = 0;            // gap = z + gap_offset
    double ln_prefactor = 0, ln_prefactor_stderr = 0;            // a: ln(I_data / I_model)
    double correlation_work_function_gap = 0;                    // corr(φ̄, s0)
    double t_quantile = 0;
    double residual_rms_ln = 0;                                  // unweighted RMS of ln|I| residuals
    std::size_t points_used = 0;

    // Comparison with the slope: the model's own φ_ap over the fitted gaps (weighted slope of the
    // fitted model curve, the same weights) and the data's φ_ap from the linear fit.
    double model_apparent_barrier_J = 0;
    double data_apparent_barrier_J = 0;
    double gap_min_m = 0, gap_max_m = 0;  // fitted gaps of the used points
    // How far the mean work function lies above the data's φ_ap (J): the image potential's share.
    double work_function_above_apparent_barrier_J() const { return mean_work_function_J - data_apparent_barrier_J; }

    // The fitted model ln|I| at the used points (z ascending), for plots.
    std::vector<double> z_m, ln_current_fit;
    std::vector<std::string> warnings;
};

// Fits the model to one sweep. linear: the linear fit of the same sweep (fit_sweep) whose used
// points, noise and fitted line set the points and weights; bias_V: the sweep's bias (V), non-zero.
// Throws tipgap::error (input) when the bias is missing or zero, or fewer than 4 points were used.
model_fit_result fit_model_to_sweep(const config& c, const curve_sweep& sweep, const fit_result& linear, double bias_V,
                                    const model_fit_options& options = {}, const location& where = {});

// The config with the mean work function set to mean_J, the tip-sample difference held (J).
config with_mean_work_function(const config& c, double mean_J);

}  // namespace tipgap
