#pragma once
// Setpoint planning: the gap at which the configured junction and tip carry a requested current at a
// given bias, and what that gap means at the instrument (resistance, conductance, decay, warnings).
#include <cmath>
#include <limits>
#include <string>
#include <utility>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/model/current.hpp"

namespace tipgap {

// Options of the gap solver. The physical gap range is [0.1 nm, 5 nm]: below 0.1 nm (well inside
// the point-contact distance of ~0.25 nm) a vacuum gap has no meaning, and above 5 nm the current
// of any tip at |V| <= 10 V is far below what an instrument resolves (about 1e-20 A for 1 nm^2 at
// 0.1 V). Common practice, no source.
struct plan_options {
    double gap_min_m = 0.1e-9;        // lower end of the physical gap range (m), > 0
    double gap_max_m = 5e-9;          // upper end (m), > gap_min_m, <= 100 nm
    // Stop when |ln|I(s)| - ln|I_set|| (the relative current error) is below the larger of this and
    // 0.1 model.rel_tol: the model's own noise makes a smaller residual meaningless. With a model
    // tolerance of 1e-10 or tighter, 1e-11 leaves room under a 1e-9 round trip. [1e-15, 1e-2]
    double log_current_tol = 1e-11;
    // Or when the bracket is narrower than this (m), >= 0. ln|I| changes by ~2e10 per metre, so
    // 1e-21 m is a residual of ~2e-11; a bracket that closes on a step of the model's quadrature
    // noise ends here.
    double gap_tol_m = 1e-21;
    int max_evaluations = 30;         // total-current evaluations per solve, [4, 200]
    // Formerly the central-difference step for d ln|I|/ds (m), (0, 0.1 nm]. Unused since the slope
    // comes with each model evaluation; still validated so that existing callers keep working.
    double slope_step_m = 0.01e-9;
    // Bias (V) whose gap is the zero of plan_point::dz_m for the same setpoint current; NaN: the
    // first non-zero bias of the setpoints. Finite and non-zero when given.
    double reference_bias_V = std::numeric_limits<double>::quiet_NaN();

    // Throws tipgap::error (input) naming the field when a value is out of range.
    void validate() const;
};

enum class solve_status {
    converged,         // |ln I - ln I_set| <= log_current_tol, or the bracket or step shrank to gap_tol_m
    current_too_high,  // even at gap_min_m the current is below the setpoint
    current_too_low,   // even at gap_max_m the current is above the setpoint
    not_converged,     // max_evaluations used up (gap_m is the best point found)
    zero_bias,         // a bias of exactly 0 V: no current flows, so no gap holds a setpoint
};
template <>
struct enum_names<solve_status> {
    static constexpr enum_name<solve_status> table[] = {{solve_status::converged, "converged"},
                                                        {solve_status::current_too_high, "current_too_high"},
                                                        {solve_status::current_too_low, "current_too_low"},
                                                        {solve_status::not_converged, "not_converged"},
                                                        {solve_status::zero_bias, "zero_bias"}};
};

// Result of one gap solve.
struct gap_solution {
    double gap_m = std::numeric_limits<double>::quiet_NaN();      // NaN when unreachable
    double current_A = std::numeric_limits<double>::quiet_NaN();  // model current at gap_m (sign of the bias)
    solve_status status = solve_status::not_converged;
    // d ln|I|/ds at gap_m (1/m), from the same evaluation as current_A (NaN when unreachable).
    double d_ln_current_ds_per_m = std::numeric_limits<double>::quiet_NaN();
    int evaluations = 0;   // total-current evaluations used (the cost of the solve)
    int iterations = 0;    // evaluations after the first two (the root finder's refining steps)
    std::string message;   // empty when converged; otherwise why, and which way to change the setpoint
    bool reachable() const { return status == solve_status::converged || status == solve_status::not_converged; }
};

// Solves ln|I(s)| = ln|current_A| for the gap s on [gap_min_m, gap_max_m] by Newton's method with
// the analytic slope that comes with each model evaluation, safeguarded by bisection inside the
// bracket of evaluated gaps (Press et al., Numerical Recipes, 3rd ed. 2007, §9.4). It starts at
// the geometric middle of the range; ln|I| is nearly linear in s, so a solve takes 4-6 evaluations.
// |I| falls monotonically with the gap, so the ends of the range, evaluated when a step leaves it,
// decide reachability.
// c: validated configuration; current_A: setpoint (A), non-zero, its magnitude is used (the sign of
// the current follows the bias); bias_V: sample bias (V), non-zero, |V| <= c.model.bias_limit_V.
// Throws tipgap::error (input, keys "current" / "bias") for a zero/non-finite current or a bad bias.
gap_solution solve_gap(const config& c, double current_A, double bias_V, const plan_options& options = {});

// Everything `plan` reports at one setpoint.
struct plan_point {
    double setpoint_A = 0;   // requested current (A), as given
    double bias_V = 0;       // sample bias (V)
    gap_solution solution;
    // The rest is NaN when the setpoint is unreachable.
    double gap_resistance_ohm = std::numeric_limits<double>::quiet_NaN();  // V / I
    double conductance_G0 = std::numeric_limits<double>::quiet_NaN();      // I / (V G0)
    // From the total current's gap dependence (what a z-spectroscopy measures):
    double decay_constant_per_m = std::numeric_limits<double>::quiet_NaN();  // kappa = -1/2 d ln|I|/ds
    double nm_per_decade = std::numeric_limits<double>::quiet_NaN();         // ln 10 / (-d ln|I|/ds), in nm
    double apparent_barrier_J = std::numeric_limits<double>::quiet_NaN();    // (hbar^2/8m)(d ln|I|/ds)^2
    regime kind = regime::direct_tunnelling;
    std::vector<std::string> warnings;  // operating warnings, or the unreachable warning
    int evaluations = 0;                // total-current evaluations (the slope comes with them)
    // Height relative to the gap at options.reference_bias_V for the same setpoint current (m): what
    // an instrument records as Δz in a constant-current z(V) trace. NaN when either gap is unknown.
    double dz_m = std::numeric_limits<double>::quiet_NaN();
    std::string note;                   // why a point has no gap without being an error (zero bias)
    bool reachable() const { return solution.reachable(); }
    // The requested current with the sign of the bias (A): the sign of a setpoint is not used.
    double signed_setpoint_A() const { return std::copysign(std::abs(setpoint_A), bias_V); }
};

// Warning text for an unreachable setpoint (status current_too_high or current_too_low).
// gap_min_m/gap_max_m: the searched range (m).
std::string unreachable_warning(solve_status status, double gap_min_m, double gap_max_m);

// Solves and evaluates one setpoint. Unreachable setpoints are returned with NaN fields and the
// unreachable warning; they do not throw. Arguments as for solve_gap.
plan_point plan_setpoint(const config& c, double current_A, double bias_V, const plan_options& options = {});

// Many setpoints: (current_A, bias_V) pairs, e.g. a constant-current trace z(V) or a current ladder.
// threads: worker count (0 = all cores); results do not depend on it. A bias of exactly 0 V (a
// range through zero) is kept as a point with status zero_bias, NaN fields and a note; the others
// are answered. dz_m of each point is set against options.reference_bias_V.
// Throws tipgap::error (no_answer) when no setpoint is reachable, with the reason of the first one;
// partial results keep unreachable points with NaN fields and a warning.
std::vector<plan_point> plan_setpoints(const config& c, const std::vector<std::pair<double, double>>& setpoints,
                                       const plan_options& options = {}, int threads = 0);

}  // namespace tipgap
