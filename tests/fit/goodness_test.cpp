// Goodness of fit of the default (offset) model: the curvature test and the κ range warning.
// Curves from a generator written here (std::mt19937_64, std::normal_distribution), as in
// coverage_test.cpp.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <random>
#include <string>

#include "tipgap/fit/fit.hpp"

using namespace tipgap;

namespace {

constexpr double nm = 1e-9, pA = 1e-12;

// I = 1 nA exp(-2κz - q z²) + 2 pA white noise, 101 points over 0.5 nm.
curve_sweep curve(double kappa_per_nm, double q_per_nm2, std::uint64_t seed) {
    std::mt19937_64 rng(seed);
    std::normal_distribution<double> normal(0.0, 1.0);
    curve_sweep s;
    s.direction = sweep_direction::retract;
    for (int k = 0; k <= 100; ++k) {
        const double z = 0.5 * nm * k / 100.0, zn = z / nm;
        s.z_m.push_back(z);
        s.current_A.push_back(1e3 * pA * std::exp(-2.0 * kappa_per_nm * zn - q_per_nm2 * zn * zn) + 2.0 * pA * normal(rng));
    }
    return s;
}

bool warns(const fit_result& r, const std::string& part) {
    return std::any_of(r.warnings.begin(), r.warnings.end(), [&](const std::string& w) { return w.find(part) != std::string::npos; });
}

const double no_bias = std::numeric_limits<double>::quiet_NaN();

}  // namespace

// A barrier that changes over the gap: the local κ = 10.9 − 6 z/nm falls to ~9.1 /nm at 0.3 nm
// (q = −6 /nm², where the signal meets the noise): p far below 1e-3, and the warning points to the profile.
// Straight curves: at the 1e-3 level, 200 of them give ~0.2 false warnings; at most 2 allowed
// (binomial tail P(X >= 3) = 1e-3).
TEST(goodness, curvature_test_warns_on_curved_curves_only) {
    const fit_result curved = fit_sweep(curve(10.9, -6.0, 1), no_bias, fit_options{});
    EXPECT_LT(curved.curvature_p_value, 1e-6);
    EXPECT_TRUE(warns(curved, "not a straight line")) << curved.warnings.size();
    EXPECT_TRUE(warns(curved, "phi_ap(z) profile"));
    int false_warnings = 0;
    for (std::uint64_t seed = 100; seed < 300; ++seed)
        false_warnings += warns(fit_sweep(curve(10.9, 0.0, seed), no_bias, fit_options{}), "not a straight line");
    EXPECT_LE(false_warnings, 2);
}

TEST(goodness, decay_constant_outside_two_to_twenty_per_nm_warns) {
    EXPECT_TRUE(warns(fit_sweep(curve(25.0, 0.0, 7), no_bias, fit_options{}), "outside the usual 2-20 /nm"));
    EXPECT_FALSE(warns(fit_sweep(curve(10.9, 0.0, 7), no_bias, fit_options{}), "outside the usual 2-20 /nm"));
}
