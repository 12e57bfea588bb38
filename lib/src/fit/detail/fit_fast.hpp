#pragma once
// The lean per-pixel fit of barrier maps (grid/map_build.cpp); internal to the library.
#include <span>

#include "fit/detail/point_selection.hpp"
#include "tipgap/fit/fit.hpp"

namespace tipgap {

// The linear model of fit_sweep for one sweep, without the sliding-window profile, the warnings,
// used_rows and the option checks: the same point selection (point_selection.hpp: noise floor,
// saturation, contact, weights, reweighting passes) and statistics, with the weighted line solved
// in closed form from centred sums (Bevington & Robinson, Data Reduction and Error Analysis, 3rd
// ed. (2003), eqs. 6.12, 6.21-6.22) instead of by SVD; the results agree with fit_sweep to
// rounding. For maps of many pixels.
// z_m: m, any order, n >= 0; current_A: A, same length; bias_V: V or NaN; options: validated by
// the caller, options.model must be linear; ws: the calling thread's workspace.
// Returns false (and fills points_total, points_used and the selection fields of `out`) when
// fewer than 3 points lie above the noise floor and below saturation, where fit_sweep throws.
bool fit_sweep_fast(std::span<const double> z_m, std::span<const double> current_A, double bias_V,
                    const fit_options& options, fit_workspace& ws, fit_result& out);

}  // namespace tipgap
