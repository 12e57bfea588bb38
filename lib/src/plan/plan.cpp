// The gap solver: TOMS 748 on ln|I(s)| - ln|I_set| over the physical gap range.
#include "tipgap/plan/plan.hpp"

#include <algorithm>
#include <boost/math/tools/toms748_solve.hpp>
#include <cmath>
#include <fmt/format.h>

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
    if (!(std::isfinite(gap_max_m) && gap_max_m > gap_min_m && gap_max_m <= 100e-9))
        bad("gap_max", "must be above gap_min and at most 100 nm");
    if (!(log_current_tol >= 1e-15 && log_current_tol <= 1e-2)) bad("log_current_tol", "must be in [1e-15, 1e-2]");
    if (!(gap_tol_m >= 0 && std::isfinite(gap_tol_m))) bad("gap_tol", "must be >= 0");
    if (max_evaluations < 4 || max_evaluations > 200) bad("max_evaluations", "must be in [4, 200]");
    if (!(slope_step_m > 0 && slope_step_m <= 0.1e-9)) bad("slope_step", "must be in (0, 0.1 nm]");
}

std::string unreachable_warning(solve_status status, double gap_min_m, double gap_max_m) {
    // More current at a given gap needs a larger |bias|, and the other way round.
    const char* fix = status == solve_status::current_too_high
                          ? "even the closest gap gives less; lower the setpoint or raise the bias magnitude"
                          : "even the widest gap gives more; raise the setpoint or lower the bias magnitude";
    return fmt::format("unreachable: the current cannot be reached in the physical gap range {:g}..{:g} nm; {}",
                       gap_min_m * 1e9, gap_max_m * 1e9, fix);
}

gap_solution solve_gap(const config& c, double current_A, double bias_V, const plan_options& o) {
    o.validate();
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
    gap_solution out;
    const double target = std::log(std::abs(current_A));
    const double log_tol = std::max(o.log_current_tol, 0.1 * c.model.rel_tol);
    double best_s = 0, best_f = std::numeric_limits<double>::infinity(), best_I = 0;
    auto f = [&](double s) {
        ++out.evaluations;
        const double I = total_current(c.model, c.geometry, s, bias_V);
        // |I| = 0 (underflow far out) reads as an infinitely small current.
        const double r = I != 0.0 ? std::log(std::abs(I)) - target : -std::numeric_limits<double>::max();
        if (std::abs(r) < std::abs(best_f)) {
            best_f = r;
            best_s = s;
            best_I = I;
        }
        return r;
    };
    const double f_lo = f(o.gap_min_m);
    if (f_lo < 0) {
        out.status = solve_status::current_too_high;
        out.message = unreachable_warning(out.status, o.gap_min_m, o.gap_max_m);
        return out;
    }
    const double f_hi = f(o.gap_max_m);
    if (f_hi > 0) {
        out.status = solve_status::current_too_low;
        out.message = unreachable_warning(out.status, o.gap_min_m, o.gap_max_m);
        return out;
    }
    bool bracket_closed = f_lo == 0.0 || f_hi == 0.0;
    if (!bracket_closed) {
        // Boost checks the tolerance after every step; stopping on the residual as well as on the
        // bracket width saves the last steps once the current is right to log_current_tol.
        auto tol = [&](double a, double b) {
            return std::abs(best_f) <= log_tol || std::abs(b - a) <= o.gap_tol_m;
        };
        boost::uintmax_t budget = static_cast<boost::uintmax_t>(o.max_evaluations - 2);
        // On an exhausted budget Boost returns the current bracket (no exception); the best point is kept.
        auto ab = boost::math::tools::toms748_solve(f, o.gap_min_m, o.gap_max_m, f_lo, f_hi, tol, budget);
        bracket_closed = std::abs(ab.second - ab.first) <= o.gap_tol_m;
    }
    out.iterations = out.evaluations - 2;
    out.gap_m = best_s;
    out.current_A = best_I;
    const bool closed = std::abs(best_f) <= log_tol;
    out.status = closed || bracket_closed ? solve_status::converged : solve_status::not_converged;
    if (out.status == solve_status::not_converged) {
        out.message = fmt::format("the gap solver used its {} evaluations; the current at the best gap is off by {:.2g} "
                                  "relative",
                                  o.max_evaluations, std::expm1(std::abs(best_f)));
    }
    return out;
}

}  // namespace tipgap
