#pragma once
// The point selection of the linear model, one routine for both fits: the per-curve fit
// (fit_sweep, with an SVD line solver) and the per-pixel fit of maps (fit_sweep_fast, with
// centred sums). Each fit runs the same steps on the same buffers, so the two cannot select
// differently:
//   1. sorted_sweep::assign       the sweep sorted by z, closest first
//   2. select_points             noise, noise floor, saturation, contact
//   3. fit_linear_points         the points above the floor, their weights, the reweighted line
//   4. record_linear_fit         the linear model's result fields
#include <cstddef>
#include <span>
#include <vector>

#include "fit/detail/fit_internal.hpp"
#include "tipgap/fit/fit.hpp"

namespace tipgap {
namespace detail {

// A sweep sorted by z, closest first, as a stable sort orders it (tied z keep their file order).
struct sorted_sweep {
    std::vector<double> z;               // m, ascending
    std::vector<double> current;         // A, signed as measured
    std::vector<double> abs_current;     // |I|, A
    std::vector<double> ln_abs_current;  // ln|I| (0 where I = 0); filled by fit_linear_points
    std::vector<std::size_t> order;      // order[k]: the input row at sorted position k
    double max_abs_current = 0.0;        // A
    bool ties = false;                   // some points share one z

    // z_m: m, any order, n >= 0; current_A: A, the same length. Reuses the buffers.
    void assign(std::span<const double> z_m, std::span<const double> current_A);
};

}  // namespace detail

// Reusable buffers of the point selection and the linear fit, so that fitting many pixels
// allocates nothing per pixel once they have grown. One workspace per thread; its contents
// between calls are of no interest to the caller.
struct fit_workspace {
    detail::sorted_sweep sweep;
    std::vector<double> far_first, scratch;  // the noise estimate's buffers
    // The linear model's points (indices into `sweep`, ascending z) and their weights, and the
    // candidates of the next reweighting pass.
    std::vector<std::size_t> used, next;
    std::vector<double> weights, next_weights;
};

namespace detail {

// What select_points found: the noise, the thresholds in use and the contact.
struct point_selection {
    noise_estimate noise;                // the far tail's estimate (see estimate_noise)
    double current_noise_A = 0.0;        // σ_I for the weights, A
    bool current_noise_estimated = false;
    bool noiseless = false;              // the tail showed no noise: σ_I = noiseless_sigma_fraction · max|I|
    double noise_floor_A = 0.0;          // A
    bool noise_floor_estimated = false;
    double saturation_A = 0.0;           // A; 0 = none
    bool saturation_detected = false;
    contact_result contact;
    std::size_t points_saturated = 0;    // outside contact, |I| at or above the saturation
    std::size_t points_below_floor = 0;  // outside contact, |I| below the floor

    // Point i (|I| = abs_current_A) lies outside contact and below saturation: the offset model
    // uses it.
    bool usable_by_offset(std::size_t i, double abs_current_A) const {
        return i >= contact.points_in_contact && (saturation_A <= 0.0 || abs_current_A < saturation_A);
    }
    // ... and its current is non-zero (ln|I| exists): the linear model may use it, when it also lies
    // above the floor (fit_linear_points).
    bool usable_by_linear(std::size_t i, double abs_current_A) const {
        return usable_by_offset(i, abs_current_A) && abs_current_A > 0.0;
    }
    // Copies the selection into the fields of the same names of `r`.
    void record(fit_result& r) const;
};

// Step 2: noise from the far tail, the floor and saturation (from the options, or estimated),
// and a contact at the close end, of ws.sweep (sorted, n >= 3). bias_V: V or NaN.
point_selection select_points(fit_workspace& ws, double bias_V, const fit_options& options);

// The weighted line ln|I| = intercept + slope z over the sweep's points idx, weights w (same length).
using line_solver = line_fit (*)(const sorted_sweep& s, std::span<const std::size_t> idx, std::span<const double> w);

enum class linear_status {
    fitted,
    too_few_points,  // fewer than 3 usable points above the noise floor
    no_spread_in_z,  // the points above the floor share one z: the slope is undefined
    singular,        // the line's slope or its standard error is not finite
};

struct linear_points {
    linear_status status = linear_status::fitted;
    line_fit line;  // the final line when fitted
};

// Step 3: the usable points above the noise floor, weighted (|I|/σ_I)², then linear_passes
// reweighting passes that select and weight by the fitted current (see fit_internal.hpp). Leaves
// the points and weights in ws.used and ws.weights: on failure, the first selection.
linear_points fit_linear_points(fit_workspace& ws, const point_selection& selection, line_solver solve);

// log10(max |I| / min |I|) over the points ws.used.
double current_decades(const fit_workspace& ws);

// Step 4: the linear model's fields of `r` (z_ref, line, prefactor, residuals, decades, κ and φ_ap
// with their intervals) from `line` over ws.used. r.confidence_level and r.calibration_uncertainty
// must be set.
void record_linear_fit(fit_result& r, fit_workspace& ws, const line_fit& line);

// The offset model (fit_offset_sweep.cpp): every point outside contact and below saturation,
// weighted by the noise model re-estimated from the residuals, started from `line`; fills the
// model's fields of `r` (κ, φ_ap, offset, noise model, χ²/dof, curvature test). Throws
// tipgap::error (input, at `where`) with fewer than 4 usable points.
void record_offset_fit(fit_result& r, const fit_workspace& ws, const point_selection& selection, const line_fit& line,
                       const fit_options& options, const location& where);

}  // namespace detail
}  // namespace tipgap
