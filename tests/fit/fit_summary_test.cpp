// The many-curve summary: Birge-scaled weighted mean and the approach - retract difference.
#include <gtest/gtest.h>

#include <cmath>
#include <vector>

#include "tipgap/fit/fit_summary.hpp"

using namespace tipgap;

// Values worked by hand from the formulas in fit_summary.hpp (Birge, Phys. Rev. 40, 207 (1932)).
TEST(fit_summary, weighted_mean_and_birge_ratio) {
    // 10 ± 1 and 12 ± 1: mean 11, se 1/√2; χ² = 1 + 1 = 2 over 1 dof, R = √2 > 1, so the se is
    // scaled to 1; spread (sample sd) √2.
    const std::vector<double> v = {10.0, 12.0}, s = {1.0, 1.0};
    const weighted_mean m = combine_weighted(v, s);
    EXPECT_DOUBLE_EQ(m.mean, 11.0);
    EXPECT_DOUBLE_EQ(m.birge_ratio, std::sqrt(2.0));
    EXPECT_NEAR(m.standard_error, 1.0, 1e-15);
    EXPECT_NEAR(m.spread, std::sqrt(2.0), 1e-15);
    // Consistent values (R < 1) keep the plain 1/sqrt(Σw): 1 ± 1 and 1.5 ± 2: w = 1, 0.25.
    const std::vector<double> v2 = {1.0, 1.5}, s2 = {1.0, 2.0};
    const weighted_mean c = combine_weighted(v2, s2);
    EXPECT_DOUBLE_EQ(c.mean, (1.0 + 0.25 * 1.5) / 1.25);
    EXPECT_LT(c.birge_ratio, 1.0);
    EXPECT_DOUBLE_EQ(c.standard_error, 1.0 / std::sqrt(1.25));
}

TEST(fit_summary, approach_minus_retract_with_p_value) {
    std::vector<fit_result> fits(2);
    fits[0].direction = sweep_direction::approach;
    fits[0].decay_constant_per_m = 10.3e9;
    fits[0].decay_constant_stderr_per_m = 0.3e9;
    fits[1].direction = sweep_direction::retract;
    fits[1].decay_constant_per_m = 9.9e9;
    fits[1].decay_constant_stderr_per_m = 0.4e9;
    for (fit_result& f : fits) {
        f.apparent_barrier_J = apparent_barrier_from_decay(f.decay_constant_per_m);
        f.apparent_barrier_stderr_J = 2.0 * f.apparent_barrier_J * f.decay_constant_stderr_per_m / f.decay_constant_per_m;
    }
    const fit_summary s = summarise_fits(fits);
    // d = 0.4, σ_d = 0.5, z = 0.8: p = 2(1 - Φ(0.8)) = 0.42371497... (scipy.stats.norm.sf(0.8) * 2).
    EXPECT_NEAR(s.hysteresis_per_m, 0.4e9, 1e-3);
    EXPECT_NEAR(s.hysteresis_stderr_per_m, 0.5e9, 1e-3);
    EXPECT_NEAR(s.hysteresis_p_value, 0.4237107971667934, 1e-12);
    EXPECT_EQ(s.decay_constant_per_m.count, 2u);
    EXPECT_NE(describe_summary(s).find("approach - retract"), std::string::npos);
}

// The text: each value with its error to two significant digits and rounded to match (issue 15),
// and a p value below double resolution as "p < 1e-15", never "p = 0".
TEST(fit_summary, text_rounds_values_to_their_errors_and_bounds_tiny_p_values) {
    fit_summary s;
    s.decay_constant_per_m = {.mean = 10.8034e9, .standard_error = 0.0011e9, .birge_ratio = 1.0, .spread = 0.002e9, .count = 3};
    s.apparent_barrier_J = {.mean = 4.44312 * 1.602176634e-19, .standard_error = 0.00093 * 1.602176634e-19, .birge_ratio = 1.0,
                            .spread = 0.0017 * 1.602176634e-19, .count = 3};
    s.hysteresis_per_m = -0.266e9;
    s.hysteresis_stderr_per_m = 0.0023e9;
    s.hysteresis_p_value = 0.0;
    s.approach_decay_per_m.count = 1;
    s.retract_decay_per_m.count = 1;
    const std::string t = describe_summary(s);
    EXPECT_NE(t.find("kappa  10.8034 ± 0.0011 /nm"), std::string::npos) << t;
    EXPECT_NE(t.find("phi_ap 4.44312 ± 0.00093 eV"), std::string::npos) << t;
    EXPECT_NE(t.find("kappa -0.2660 ± 0.0023 /nm over 1 and 1 sweeps, p < 1e-15 (significant"), std::string::npos) << t;
}
