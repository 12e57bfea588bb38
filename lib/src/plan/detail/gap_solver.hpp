#pragma once
// The gap solver with a starting gap: a Monte Carlo draw or a neighbouring setpoint starts from a
// gap known to be close, and Newton's method then needs two or three evaluations instead of a cold
// start's five or six.
#include "tipgap/plan/plan.hpp"

namespace tipgap::detail {

// solve_gap starting at guess_m (m); a guess that is not finite or not inside the gap range starts
// at the geometric middle of the range, as solve_gap does. Same arguments, checks and results.
gap_solution solve_gap_from(const config& c, double current_A, double bias_V, const plan_options& options,
                            double guess_m);

// plan_setpoint with the solve started at guess_m (as solve_gap_from).
plan_point plan_setpoint_from(const config& c, double current_A, double bias_V, const plan_options& options,
                              double guess_m);

}  // namespace tipgap::detail
