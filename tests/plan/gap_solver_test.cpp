// The Newton gap solver: a warm start lands on the same gap in a few evaluations, and the slope
// that plan reports is the model's analytic one.
#include <gtest/gtest.h>

#include <cmath>

#include "plan/detail/gap_solver.hpp"
#include "tipgap/config/config.hpp"
#include "tipgap/model/geometry.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/predict.hpp"

using namespace tipgap;

// Started a few pm from the answer (a Monte Carlo draw starts at the nominal gap), Newton needs at
// most three evaluations, and the gap is the cold start's to the solver tolerance: both stop at
// |ln I - ln I_set| <= 1e-7 (0.1 rel_tol), i.e. within 1e-7 / |d ln I/ds| ~ 5e-18 m of the root.
TEST(gap_solver, warm_start_reaches_the_same_gap_in_three_evaluations) {
    constexpr int kWarmBudget = 3;
    for (geometry_kind kind : {geometry_kind::planar, geometry_kind::paraboloid, geometry_kind::contact_anchored}) {
        config c = default_config();
        c.geometry.kind = kind;
        for (double V : {0.1, -1.0})
            for (double I : {1e-11, 1e-8}) {
                const gap_solution cold = solve_gap(c, I, V);
                ASSERT_EQ(cold.status, solve_status::converged);
                for (double offset : {-0.02e-9, 0.02e-9}) {
                    const gap_solution warm = detail::solve_gap_from(c, I, V, {}, cold.gap_m + offset);
                    ASSERT_EQ(warm.status, solve_status::converged);
                    EXPECT_LE(warm.evaluations, kWarmBudget) << to_string(kind) << " " << I << " A " << V << " V";
                    const double tolerance = 2.0 * 1e-7 / std::abs(cold.d_ln_current_ds_per_m);
                    EXPECT_NEAR(warm.gap_m, cold.gap_m, tolerance);
                }
            }
    }
}

// Planar: plan's slope comes from the same pass as predict's d ln J/ds, so both report the same
// decay constant to the last bit (both are J's analytic gap derivative over J at that gap).
TEST(gap_solver, plan_and_predict_report_the_same_decay_constant) {
    const config c = default_config();
    const plan_point p = plan_setpoint(c, 1e-9, 0.1);
    ASSERT_TRUE(p.reachable());
    const prediction q = predict_points(c, {{p.solution.gap_m, 0.1}}, 1).front();
    EXPECT_EQ(p.decay_constant_per_m, q.q.decay_constant_per_m);
}

// Unreachable setpoints are still decided by the ends of the range.
TEST(gap_solver, ends_of_the_range_decide_reachability) {
    const config c = default_config();
    EXPECT_EQ(solve_gap(c, 1.0, 0.1).status, solve_status::current_too_high);
    EXPECT_EQ(solve_gap(c, 1e-60, 0.1).status, solve_status::current_too_low);
    EXPECT_EQ(detail::solve_gap_from(c, 1.0, 0.1, {}, 0.3e-9).status, solve_status::current_too_high);
}
