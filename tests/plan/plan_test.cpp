// Setpoint planning: round trip through predict, solve cost, z(V) monotonicity, every warning from a
// crafted case, and the no-answer error.
#include <gtest/gtest.h>

#include <cmath>
#include <string>
#include <tuple>

#include "tipgap/config/config.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/model/geometry.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/predict.hpp"
#include "tipgap/plan/warnings.hpp"

using namespace tipgap;

namespace {

config with_geometry(geometry_kind kind, double rel_tol) {
    config c = default_config();  // tungsten tip, gold sample, exact image potential, 4.2 K
    c.geometry.kind = kind;
    c.model.rel_tol = rel_tol;
    return c;
}

bool has_warning(const plan_point& p, const std::string& start) {
    for (const auto& w : p.warnings)
        if (w.rfind(start, 0) == 0) return true;
    return false;
}

}  // namespace

// The contract: predict at the planned gap returns the requested current to 1e-9. With the
// model at 1e-10 the solver stops at |ln I - ln I_set| <= 1e-11, so 1e-9 has two orders of margin.
TEST(plan, round_trip_through_predict) {
    constexpr double round_trip_tolerance = 1e-9;  // the requirement
    for (geometry_kind kind : {geometry_kind::planar, geometry_kind::paraboloid, geometry_kind::contact_anchored}) {
        const config c = with_geometry(kind, 1e-10);
        for (double V : {-1.5, 0.02, 0.1, 4.0})
            for (double I : {1e-12, 1e-9, 1e-7}) {
                const gap_solution g = solve_gap(c, I, V);
                ASSERT_EQ(g.status, solve_status::converged) << to_string(kind) << " " << I << " A " << V << " V";
                const prediction p = predict_points(c, {{g.gap_m, V}}, 1).front();
                EXPECT_NEAR(std::abs(p.current_A) / I, 1.0, round_trip_tolerance)
                    << to_string(kind) << " " << I << " A " << V << " V";
                // The sign of the current follows the bias.
                EXPECT_EQ(std::signbit(p.current_A), std::signbit(V));
            }
    }
}

// The budget: at most about 30 model evaluations per solve. Over a wide set of setpoints the
// solver needs at most 12 at the default tolerance (measured: mean 7, max 9-11).
TEST(plan, solve_cost_within_budget) {
    constexpr int budget = 12;  // measured maximum 11 over this grid, plus one of margin
    for (geometry_kind kind : {geometry_kind::planar, geometry_kind::paraboloid, geometry_kind::contact_anchored}) {
        const config c = with_geometry(kind, 1e-6);
        int total = 0, n = 0;
        for (double V : {-2.0, -0.1, 0.01, 0.1, 1.0, 3.0, 8.0})
            for (double I : {1e-12, 1e-10, 1e-9, 1e-8, 1e-6}) {
                const gap_solution g = solve_gap(c, I, V);
                ASSERT_TRUE(g.reachable());
                EXPECT_LE(g.evaluations, budget) << to_string(kind) << " " << I << " A " << V << " V";
                EXPECT_EQ(g.iterations, g.evaluations - 2);
                total += g.evaluations;
                ++n;
            }
        RecordProperty(std::string("mean_evaluations_") + to_string(kind), std::to_string(double(total) / n));
    }
}

// A barrier that only gets more transparent with |V| (identical electrodes, so no built-in field):
// at constant current the gap must grow monotonically with |V|.
TEST(plan, constant_current_trace_is_monotonic) {
    config c = parse_config("tip: { material: gold }\nsample: { material: gold }\n", "gold-gold");
    std::vector<std::pair<double, double>> trace;
    for (int i = 0; i <= 30; ++i) trace.emplace_back(1e-9, 0.05 + 0.1 * i);
    const auto up = plan_setpoints(c, trace, {}, 2);
    for (auto& t : trace) t.second = -t.second;
    const auto down = plan_setpoints(c, trace, {}, 2);
    for (std::size_t i = 1; i < up.size(); ++i) {
        EXPECT_GT(up[i].solution.gap_m, up[i - 1].solution.gap_m) << "V = " << up[i].bias_V;
        EXPECT_GT(down[i].solution.gap_m, down[i - 1].solution.gap_m) << "V = " << down[i].bias_V;
    }
    // Identical electrodes: I(-V) = -I(V), so the two traces coincide to the solver tolerance.
    for (std::size_t i = 0; i < up.size(); ++i) EXPECT_NEAR(up[i].solution.gap_m / down[i].solution.gap_m, 1.0, 1e-6);
}

TEST(plan, instrument_quantities_are_consistent) {
    const config c = with_geometry(geometry_kind::planar, 1e-9);
    const plan_point p = plan_setpoint(c, 1e-9, 0.1);
    ASSERT_TRUE(p.reachable());
    EXPECT_NEAR(p.gap_resistance_ohm / 1e8, 1.0, 1e-9);  // 0.1 V / 1 nA = 100 MOhm
    EXPECT_NEAR(p.conductance_G0 * si::conductance_quantum * 1e8, 1.0, 1e-9);
    // nm per decade and the apparent barrier both come from d ln I/ds: ln10/(2 kappa) and
    // (hbar^2/8m)(2 kappa)^2 (definitions; Binnig & Rohrer 1982).
    EXPECT_NEAR(p.nm_per_decade, std::log(10.0) / (2.0 * p.decay_constant_per_m) * 1e9, 1e-12);
    EXPECT_NEAR(p.apparent_barrier_J / (si::hbar * si::hbar / (8 * si::electron_mass) * 4 * p.decay_constant_per_m *
                                        p.decay_constant_per_m),
                1.0, 1e-12);
    // For the planar geometry the total current's slope is J's: the same kappa as predict reports.
    const prediction q = predict_points(c, {{p.solution.gap_m, 0.1}}, 1).front();
    EXPECT_NEAR(p.decay_constant_per_m / q.q.decay_constant_per_m, 1.0, 1e-5);  // both O(h^2) ~1e-5 differences
    EXPECT_TRUE(p.warnings.empty());
}

// --- warnings, each from a crafted case -------------------------------------------------------

TEST(plan, near_contact_warning) {
    // 1 uA at 10 mV is 1e-4 S = 1.3 G0: far above the 0.01 G0 limit (1 nm^2 reaches ~9 uA at 0.1 nm).
    const plan_point p = plan_setpoint(with_geometry(geometry_kind::planar, 1e-6), 1e-6, 0.01);
    ASSERT_TRUE(p.reachable());
    EXPECT_GT(p.conductance_G0, near_contact_conductance_G0);
    EXPECT_TRUE(has_warning(p, "near contact: gap ")) << (p.warnings.empty() ? "" : p.warnings[0]);
}

TEST(plan, field_emission_and_high_voltage_warning) {
    // 8 V against a 4.55 eV tip: |eV| is above the collector-side barrier.
    const plan_point p = plan_setpoint(with_geometry(geometry_kind::planar, 1e-6), 1e-9, 8.0);
    ASSERT_TRUE(p.reachable());
    EXPECT_EQ(p.kind, regime::field_emission);
    ASSERT_TRUE(has_warning(p, "field-emission regime: |eV| = 8 eV exceeds the barrier; high voltage on the tip"));
}

TEST(plan, collapsed_barrier_warning) {
    // Craft the setpoint from a gap where the image-lowered barrier is gone at 0.1 V.
    const config c = with_geometry(geometry_kind::planar, 1e-6);
    const double s = 0.15e-9;
    ASSERT_EQ(classify(c.model, s, 0.1), regime::barrier_collapsed) << "precondition of the crafted case";
    const double I = total_current(c.model, c.geometry, s, 0.1);
    const plan_point p = plan_setpoint(c, I, 0.1);
    ASSERT_TRUE(p.reachable());
    EXPECT_NEAR(p.solution.gap_m / s, 1.0, 1e-6);
    EXPECT_EQ(p.kind, regime::barrier_collapsed);
    EXPECT_TRUE(has_warning(p, "barrier collapsed: the image-lowered barrier top is below the emitting Fermi level"));
    EXPECT_TRUE(has_warning(p, "near contact"));
}

TEST(plan, unreachable_warnings_say_which_way) {
    const config c = with_geometry(geometry_kind::planar, 1e-6);
    const plan_point high = plan_setpoint(c, 1.0, 0.1);  // 1 A through 1 nm^2 at 0.1 V
    EXPECT_EQ(high.solution.status, solve_status::current_too_high);
    EXPECT_TRUE(std::isnan(high.solution.gap_m));
    EXPECT_TRUE(std::isnan(high.nm_per_decade));
    ASSERT_EQ(high.warnings.size(), 1u);
    EXPECT_EQ(high.warnings[0],
              "unreachable: the current cannot be reached in the physical gap range 0.1..5 nm; even the closest gap "
              "gives less; lower the setpoint or raise the bias magnitude");
    const plan_point low = plan_setpoint(c, 1e-60, 0.1);  // ~1e-51 A remain at 5 nm
    EXPECT_EQ(low.solution.status, solve_status::current_too_low);
    ASSERT_EQ(low.warnings.size(), 1u);
    EXPECT_EQ(low.warnings[0],
              "unreachable: the current cannot be reached in the physical gap range 0.1..5 nm; even the widest gap "
              "gives more; raise the setpoint or lower the bias magnitude");
}

TEST(plan, partial_trace_keeps_unreachable_points_and_no_answer_throws) {
    const config c = with_geometry(geometry_kind::planar, 1e-6);
    const auto mixed = plan_setpoints(c, {{1e-9, 0.1}, {1.0, 0.1}}, {}, 1);
    ASSERT_EQ(mixed.size(), 2u);
    EXPECT_TRUE(mixed[0].reachable());
    EXPECT_FALSE(mixed[1].reachable());
    EXPECT_TRUE(std::isnan(mixed[1].solution.gap_m));
    try {
        plan_setpoints(c, {{1.0, 0.1}}, {}, 1);
        FAIL() << "no answer must throw";
    } catch (const error& e) {
        EXPECT_EQ(e.kind(), error_kind::no_answer);
        EXPECT_EQ(std::string(e.what()),
                  "1 A at 0.1 V: unreachable: the current cannot be reached in the physical gap range 0.1..5 nm; even "
                  "the closest gap gives less; lower the setpoint or raise the bias magnitude");
    }
}

TEST(plan, bad_input_is_an_input_error) {
    const config c = with_geometry(geometry_kind::planar, 1e-6);
    for (auto [I, V, key] : {std::tuple{1e-9, 0.0, "bias"}, std::tuple{0.0, 0.1, "current"},
                             std::tuple{1e-9, 50.0, "bias"}}) {
        try {
            solve_gap(c, I, V);
            FAIL() << "expected an input error for " << I << " A, " << V << " V";
        } catch (const error& e) {
            EXPECT_EQ(e.kind(), error_kind::input);
            EXPECT_EQ(e.where().key, key);
        }
    }
    plan_options o;
    o.gap_max_m = o.gap_min_m;
    EXPECT_THROW(solve_gap(c, 1e-9, 0.1, o), error);
}

// A z(V) trace through 0 V: every other bias answered, the 0 V point kept without a gap; dz_m is
// the gap minus the gap at the reference bias for the same current (plan.hpp).
TEST(plan, trace_through_zero_keeps_the_zero_point_and_dz_follows_the_reference) {
    const config c = default_config();
    const std::vector<std::pair<double, double>> sp = {{1e-10, -0.5}, {1e-10, 0.0}, {1e-10, 0.5}, {1e-9, 0.5}};
    const auto pts = plan_setpoints(c, sp, {}, 1);
    ASSERT_EQ(pts.size(), 4u);
    EXPECT_EQ(pts[1].solution.status, solve_status::zero_bias);
    EXPECT_FALSE(pts[1].reachable());
    EXPECT_TRUE(std::isnan(pts[1].solution.gap_m));
    EXPECT_TRUE(std::isnan(pts[1].dz_m));
    EXPECT_FALSE(pts[1].note.empty());
    for (std::size_t i : {0u, 2u, 3u}) EXPECT_EQ(pts[i].solution.status, solve_status::converged) << i;
    // Default reference: the first non-zero bias, -0.5 V, for each current.
    EXPECT_EQ(pts[0].dz_m, 0.0);
    EXPECT_NEAR(pts[2].dz_m, pts[2].solution.gap_m - pts[0].solution.gap_m, 1e-24);
    const double ref_1nA = plan_setpoint(c, 1e-9, -0.5).solution.gap_m;
    EXPECT_NEAR(pts[3].dz_m, pts[3].solution.gap_m - ref_1nA, 1e-15);
    // Another reference bias.
    plan_options o;
    o.reference_bias_V = 0.5;
    const auto at = plan_setpoints(c, sp, o, 1);
    EXPECT_EQ(at[2].dz_m, 0.0);
    EXPECT_EQ(at[3].dz_m, 0.0);
    EXPECT_NEAR(at[0].dz_m, at[0].solution.gap_m - at[2].solution.gap_m, 1e-24);
    // Only zero biases: the request is wrong (input error naming the bias), as for a single point.
    try {
        plan_setpoints(c, {{1e-10, 0.0}}, {}, 1);
        ADD_FAILURE() << "no error";
    } catch (const error& e) {
        EXPECT_EQ(e.kind(), error_kind::input);
        EXPECT_EQ(e.where().key, "bias");
    }
    o.reference_bias_V = 0.0;
    EXPECT_THROW(o.validate(), error);
}
