// Uncertainty propagation: Monte Carlo against linear propagation for small input uncertainties,
// reproducibility with a seed, the truncated (redrawn) normal, and the quantile definition.
#include <gtest/gtest.h>

#include <boost/math/special_functions/erf.hpp>
#include <cmath>

#include "core/detail/quantile.hpp"
#include "tipgap/config/config.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/plan/uncertainty.hpp"

using namespace tipgap;
using tipgap::detail::quantile_sorted;

namespace {
constexpr double eV = si::electron_volt;

config small_sigma(double sigma_eV) {
    config c = default_config();
    c.sigma.tip_work_function_J = sigma_eV * eV;
    c.sigma.sample_work_function_J = sigma_eV * eV;
    return c;
}

// With N draws the sample standard deviation of a near-normal output has a relative standard error
// of 1/sqrt(2(N-1)) (normal theory, e.g. JCGM 101 §7.6 discussion); 4 of them bound a chance
// failure below 1e-4. Linear propagation of a 0.01 eV input is exact to O(u^2) relative: the
// curvature of the outputs over ±0.03 eV is ~1e-2 of the slope, far inside that bound.
double stddev_tolerance(int n) { return 4.0 / std::sqrt(2.0 * (n - 1)); }
constexpr int draws = 2000;
}  // namespace

TEST(uncertainty, monte_carlo_agrees_with_linear_propagation_for_plan) {
    uncertainty_options o;
    o.samples = draws;
    o.seed = 20240611;
    const auto u = plan_uncertainty(small_sigma(0.01), 1e-9, 0.1, {}, o);
    ASSERT_EQ(u.names, (std::vector<std::string>{"gap_nm", "nm_per_decade", "apparent_barrier_eV"}));
    EXPECT_EQ(u.inputs, (std::vector<std::string>{"tip.work_function", "sample.work_function"}));
    EXPECT_EQ(u.failed, 0);
    for (std::size_t k = 0; k < u.values.size(); ++k) {
        const auto& v = u.values[k];
        ASSERT_GT(v.linear_stddev, 0.0) << u.names[k];
        EXPECT_NEAR(v.mc_stddev / v.linear_stddev, 1.0, stddev_tolerance(draws)) << u.names[k];
        RecordProperty("ratio_" + u.names[k], std::to_string(v.mc_stddev / v.linear_stddev));
        // The mean of N draws is within 4 standard errors of the nominal value.
        EXPECT_NEAR(v.mc_mean, v.value, 4.0 * v.linear_stddev / std::sqrt(double(draws))) << u.names[k];
        // The 95 % interval of a near-normal output is ±1.96 u: compare half-widths, with the
        // quantiles' larger sampling error (about twice the stddev's) allowed.
        EXPECT_NEAR((v.ci95_high - v.ci95_low) / (v.linear_ci95_high - v.linear_ci95_low), 1.0,
                    2.0 * stddev_tolerance(draws))
            << u.names[k];
    }
    // The gap's sensitivity has a physical size: a 0.01 eV change of both work functions moves the
    // gap by a few pm (d s / d phi = s / (2 phi) for J ~ exp(-2 s sqrt(2 m phi)/hbar) at fixed J,
    // i.e. 0.6 nm / (2 * 4.9 eV) * 0.01 eV * sqrt(2) ~ 0.9 pm; the prefactor and image term change
    // this by tens of percent, so 0.3..3 pm).
    EXPECT_GT(u.values[0].linear_stddev, 0.3e-3);
    EXPECT_LT(u.values[0].linear_stddev, 3e-3);
}

TEST(uncertainty, monte_carlo_agrees_with_linear_propagation_for_predict) {
    uncertainty_options o;
    o.samples = 1000;  // the paraboloid costs ~80 J per current: fewer draws, wider tolerance
    o.seed = 7;
    config c = small_sigma(0.01);
    c.geometry.kind = geometry_kind::paraboloid;
    c.sigma.apex_radius_m = 0.1e-9;  // 10 ± 0.1 nm: the current is proportional to R, so linear
    const auto u = predict_uncertainty(c, 0.6e-9, 0.1, o);
    ASSERT_EQ(u.inputs.size(), 3u);
    for (std::size_t k = 0; k < u.values.size(); ++k) {
        const auto& v = u.values[k];
        ASSERT_GT(v.linear_stddev, 0.0) << u.names[k];
        EXPECT_NEAR(v.mc_stddev / v.linear_stddev, 1.0, stddev_tolerance(o.samples)) << u.names[k];
        RecordProperty("ratio_" + u.names[k], std::to_string(v.mc_stddev / v.linear_stddev));
    }
}

TEST(uncertainty, seeded_monte_carlo_is_reproducible_and_thread_independent) {
    const config c = small_sigma(0.2);
    uncertainty_options o;
    o.samples = 64;
    o.seed = 42;
    o.linear = false;
    o.threads = 1;
    const auto a = plan_uncertainty(c, 1e-9, 0.1, {}, o);
    o.threads = 2;
    const auto b = plan_uncertainty(c, 1e-9, 0.1, {}, o);
    o.seed = 43;
    const auto d = plan_uncertainty(c, 1e-9, 0.1, {}, o);
    for (std::size_t k = 0; k < a.values.size(); ++k) {
        EXPECT_EQ(a.values[k].mc_mean, b.values[k].mc_mean);
        EXPECT_EQ(a.values[k].mc_stddev, b.values[k].mc_stddev);
        EXPECT_EQ(a.values[k].ci95_low, b.values[k].ci95_low);
        EXPECT_EQ(a.values[k].ci95_high, b.values[k].ci95_high);
        EXPECT_NE(a.values[k].mc_mean, d.values[k].mc_mean);
        EXPECT_TRUE(std::isnan(a.values[k].linear_stddev));
    }
}

// Apex radius 10 ± 8 nm: the normal puts p = Phi((0.1 - 10)/8) = 0.10795 below the 0.1 nm floor
// (SciPy 1.10 scipy.stats.norm.cdf). Every used draw is inside the range and the redraws per draw
// average p / (1 - p) (geometric number of rejections).
TEST(uncertainty, draws_are_redrawn_into_the_physical_range) {
    config c = default_config();
    c.geometry.kind = geometry_kind::paraboloid;
    c.sigma.apex_radius_m = 8e-9;
    uncertainty_options o;
    o.samples = 20000;
    o.linear = false;
    o.threads = 1;  // the function below records draws in order
    std::vector<double> seen;
    auto f = [&](const config& x) { seen.push_back(x.geometry.apex_radius_m); return std::vector<double>{x.geometry.apex_radius_m}; };
    const auto u = propagate_uncertainty(c, {"R"}, f, o);
    const double p = 0.5 * boost::math::erfc(-((0.1 - 10.0) / 8.0) / std::sqrt(2.0));
    EXPECT_NEAR(p, 0.10795075716732466, 1e-12);  // the SciPy value quoted above
    ASSERT_EQ(seen.size(), 20001u);              // the nominal evaluation plus the draws
    for (std::size_t i = 1; i < seen.size(); ++i) ASSERT_GE(seen[i], uncertain_apex_radius_min_m);
    const double expected = o.samples * p / (1 - p);
    // A geometric count with mean m = p/(1-p) has variance p/(1-p)^2 per draw: 4 standard deviations.
    EXPECT_NEAR(u.redrawn, expected, 4.0 * std::sqrt(o.samples * p / ((1 - p) * (1 - p))));
    EXPECT_GT(u.values[0].ci95_low, uncertain_apex_radius_min_m);
}

TEST(uncertainty, no_uncertain_input_gives_nominal_only) {
    const config c = default_config();
    uncertainty_options o;
    const auto u = plan_uncertainty(c, 1e-9, 0.1, {}, o);
    EXPECT_TRUE(u.inputs.empty());
    EXPECT_EQ(u.samples, 0);
    EXPECT_TRUE(std::isfinite(u.values[0].value));
    EXPECT_TRUE(std::isnan(u.values[0].mc_stddev));
}

// numpy.quantile(x, p) with its default method "linear" (Hyndman & Fan definition 7), numpy 1.24:
// x = [0.3, 1.0, 2.5, 2.5, 4.0, 7.5, 9.0] -> 0.3, 0.405, 1.75, 2.5, 8.775, 9.0 at p = 0, 0.025,
// 0.25, 0.5, 0.975, 1.
TEST(uncertainty, quantile_matches_numpy_default) {
    const std::vector<double> x{0.3, 1.0, 2.5, 2.5, 4.0, 7.5, 9.0};
    EXPECT_DOUBLE_EQ(quantile_sorted(x, 0.0), 0.3);
    EXPECT_DOUBLE_EQ(quantile_sorted(x, 0.025), 0.405);
    EXPECT_DOUBLE_EQ(quantile_sorted(x, 0.25), 1.75);
    EXPECT_DOUBLE_EQ(quantile_sorted(x, 0.5), 2.5);
    EXPECT_DOUBLE_EQ(quantile_sorted(x, 0.975), 8.775);
    EXPECT_DOUBLE_EQ(quantile_sorted(x, 1.0), 9.0);
}

TEST(uncertainty, many_points_match_the_single_point_calls_and_skip_what_has_none) {
    uncertainty_options o;
    o.samples = 0;  // linear propagation only: deterministic and quick
    const config c = small_sigma(0.01);
    const std::vector<std::pair<double, double>> points{{0.5e-9, 0.1}, {0.7e-9, -0.2}};
    const auto many = predict_uncertainties(c, points, o);
    ASSERT_EQ(many.size(), 2u);
    for (std::size_t i = 0; i < points.size(); ++i) {
        const auto one = predict_uncertainty(c, points[i].first, points[i].second, o);
        ASSERT_EQ(many[i].values.size(), one.values.size());
        for (std::size_t k = 0; k < one.values.size(); ++k)
            EXPECT_EQ(many[i].values[k].linear_stddev, one.values[k].linear_stddev) << i << " " << one.names[k];
    }
    // Without configured uncertainties every summary is empty.
    for (const auto& u : predict_uncertainties(default_config(), points, o)) EXPECT_TRUE(u.inputs.empty());
    // plan: an unreachable setpoint (1 A at 1 mV) gets an empty summary, a reachable one the single call's.
    const auto plan = plan_setpoints(c, {{1e-9, 0.1}, {1.0, 1e-3}}, {}, 1);
    ASSERT_EQ(plan.size(), 2u);
    ASSERT_TRUE(plan[0].reachable());
    ASSERT_FALSE(plan[1].reachable());
    const auto u = plan_uncertainties(c, plan, {}, o);
    EXPECT_EQ(u[0].values[0].linear_stddev, plan_uncertainty(c, 1e-9, 0.1, {}, o).values[0].linear_stddev);
    EXPECT_TRUE(u[1].inputs.empty());
}
