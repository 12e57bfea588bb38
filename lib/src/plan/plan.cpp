// The gap solver: safeguarded Newton iteration on ln|I(s)| - ln|I_set| over the physical gap range.
#include "tipgap/core/limits.hpp"
#include "tipgap/plan/plan.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <limits>

#include "plan/detail/gap_solver.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/model/geometry.hpp"

namespace tipgap {

void plan_options::validate() const {
    auto bad = [](const char* key, const std::string& why) {
        location w;
        w.key = key;
        throw_input(w, why);
    };
    if (!(std::isfinite(gap_min_m) && gap_min_m > 0)) bad("gap_min", "must be a positive gap");
    if (!(std::isfinite(gap_max_m) && gap_max_m > gap_min_m && at_most(gap_max_m, 100e-9)))
        bad("gap_max", "must be above gap_min and at most 100 nm");
    if (!(log_current_tol >= 1e-15 && log_current_tol <= 1e-2)) bad("log_current_tol", "must be in [1e-15, 1e-2]");
    if (!(gap_tol_m >= 0 && std::isfinite(gap_tol_m))) bad("gap_tol", "must be >= 0");
    if (max_evaluations < 4 || max_evaluations > 200) bad("max_evaluations", "must be in [4, 200]");
    if (!(slope_step_m > 0 && slope_step_m <= 0.1e-9)) bad("slope_step", "must be in (0, 0.1 nm]");
    if (!std::isnan(reference_bias_V) && !(std::isfinite(reference_bias_V) && reference_bias_V != 0))
        bad("reference_bias", "must be a non-zero bias");
}

std::string unreachable_warning(solve_status status, double gap_min_m, double gap_max_m) {
    // More current at a given gap needs a larger |bias|, and the other way round.
    const char* fix = status == solve_status::current_too_high
                          ? "even the closest gap gives less; lower the setpoint or raise the bias magnitude"
                          : "even the widest gap gives more; raise the setpoint or lower the bias magnitude";
    return fmt::format("unreachable: the current cannot be reached in the physical gap range {:g}..{:g} nm; {}",
                       gap_min_m * 1e9, gap_max_m * 1e9, fix);
}

namespace {

void check_setpoint(const config& c, double current_A, double bias_V) {
    if (!(std::isfinite(current_A) && current_A != 0.0)) {
        location w;
        w.key = "current";
        throw_input(w, fmt::format("the current setpoint must be a non-zero current (got {:g} A)", current_A));
    }
    if (!(std::isfinite(bias_V) && bias_V != 0.0 && std::abs(bias_V) <= c.model.bias_limit_V)) {
        location w;
        w.key = "bias";
        throw_input(w, fmt::format("a current setpoint needs a non-zero bias with |bias| <= the bias_limit of {:g} V "
                                   "(got {:g} V)",
                                   c.model.bias_limit_V, bias_V));
    }
}

// The iteration state: the residual f(s) = ln|I(s)| - ln|I_set| falls with s, so every evaluated
// gap with f > 0 is a lower bound of the root and every one with f < 0 an upper bound.
struct newton_state {
    double lo, hi;                      // current bracket (the range ends until evaluated)
    bool lo_seen = false, hi_seen = false;  // whether f was evaluated at lo / hi
};

// The next gap after s: the Newton step while it stays inside the bracket; where it leaves, an end
// of the range not yet evaluated (which decides reachability), else bisection. This is the
// safeguarded Newton iteration of Press et al., Numerical Recipes, 3rd ed. (2007), §9.4 (rtsafe).
double next_gap(const newton_state& b, double s, double f, double slope) {
    const double t = s - f / slope;
    if (std::isfinite(t) && t > b.lo && t < b.hi) return t;
    const bool rightwards = std::isfinite(t) ? t >= b.hi : f > 0.0;
    if (rightwards && !b.hi_seen) return b.hi;
    if (!rightwards && !b.lo_seen) return b.lo;
    return 0.5 * (b.lo + b.hi);
}

}  // namespace

gap_solution solve_gap(const config& c, double current_A, double bias_V, const plan_options& o) {
    return detail::solve_gap_from(c, current_A, bias_V, o, std::numeric_limits<double>::quiet_NaN());
}

namespace detail {

gap_solution solve_gap_from(const config& c, double current_A, double bias_V, const plan_options& o, double guess) {
    o.validate();
    check_setpoint(c, current_A, bias_V);
    gap_solution out;
    const double target = std::log(std::abs(current_A));
    const double log_tol = std::max(o.log_current_tol, 0.1 * c.model.rel_tol);
    const geometry_options g = with_fixed_area(c.model, c.geometry);
    double best_f = std::numeric_limits<double>::infinity();
    newton_state b{o.gap_min_m, o.gap_max_m};
    double s = guess > o.gap_min_m && guess < o.gap_max_m ? guess : std::sqrt(o.gap_min_m * o.gap_max_m);
    bool closed = false;
    while (out.evaluations < o.max_evaluations) {
        ++out.evaluations;
        const total_current_sample x = total_current_with_slope(c.model, g, s, bias_V);
        // |I| = 0 (underflow far out) reads as an infinitely small current.
        const double f = x.current_A != 0.0 ? std::log(std::abs(x.current_A)) - target
                                             : -std::numeric_limits<double>::max();
        if (std::abs(f) < std::abs(best_f)) {
            best_f = f;
            out.gap_m = s;
            out.current_A = x.current_A;
            out.d_ln_current_ds_per_m = x.d_ln_current_ds_per_m;
        }
        if (std::abs(f) <= log_tol) break;
        (f > 0.0 ? b.lo : b.hi) = s;
        (f > 0.0 ? b.lo_seen : b.hi_seen) = true;
        if (f < 0.0 && s == o.gap_min_m) out.status = solve_status::current_too_high;
        if (f > 0.0 && s == o.gap_max_m) out.status = solve_status::current_too_low;
        if (out.status == solve_status::current_too_high || out.status == solve_status::current_too_low) {
            out.gap_m = out.current_A = out.d_ln_current_ds_per_m = std::numeric_limits<double>::quiet_NaN();
            out.message = unreachable_warning(out.status, o.gap_min_m, o.gap_max_m);
            out.iterations = std::max(0, out.evaluations - 2);
            return out;
        }
        const double t = next_gap(b, s, f, x.d_ln_current_ds_per_m);
        // The bracket, or the step, has shrunk below the gap tolerance: the root is located.
        if ((b.lo_seen && b.hi_seen && b.hi - b.lo <= o.gap_tol_m) || std::abs(t - s) <= o.gap_tol_m) {
            closed = true;
            break;
        }
        s = t;
    }
    out.iterations = std::max(0, out.evaluations - 2);
    out.status = std::abs(best_f) <= log_tol || closed ? solve_status::converged : solve_status::not_converged;
    if (out.status == solve_status::not_converged) {
        out.message = fmt::format("the gap solver used its {} evaluations; the current at the best gap is off by {:.2g} "
                                  "relative",
                                  o.max_evaluations, std::expm1(std::abs(best_f)));
    }
    return out;
}

}  // namespace detail

}  // namespace tipgap
