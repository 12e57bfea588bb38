// Coverage of the default fit's intervals on seeded synthetic curves, one family per way real
// curves depart from pure white noise (issue 10). The curves come from a generator written here
// (std::mt19937_64 and std::normal_distribution, the exponential evaluated directly), not from
// lib/synth or any code path of the fitter.
//
// Per family, 200 curves with κ = 10.9 /nm and 2 pA white current noise. Asserted:
//   coverage of the 95 % interval on κ >= 0.92 (white noise also <= 0.98: not too wide). The
//     binomial standard deviation at p = 0.95, n = 200 is 1.5 %, so an honest 95 % interval falls
//     below 0.92 with probability ~2 % per family;
//   the spread of z = (κ̂ - κ)/se (standard deviation over the curves) within 0.85-1.15: 1 for
//     standard errors that are neither too small nor too large (its own sampling sd at n = 200 is
//     ~0.05, so the band is ±3 sd);
//   on white noise, the mean χ²/dof within 0.9-1.1 (its expectation is 1 when the noise model
//     holds; sd of the mean over 200 curves of ~100 points ~0.01, the band leaves room for the
//     estimated noise parameters).
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <string>
#include <vector>

#include "tipgap/fit/fit.hpp"

using namespace tipgap;

namespace {

constexpr double nm = 1e-9, pA = 1e-12;
constexpr double true_kappa = 10.9 / nm;
constexpr int curves_per_family = 200;

struct family {
    std::string name;
    int points = 101;
    double z_last_m = 0.5 * nm;
    double i0_A = 1e3 * pA;     // current at z = 0
    double offset_A = 0.0;
    double jitter_low_m = 0.0;  // gap jitter σ_z drawn per curve, uniform in [low, high]
    double jitter_high_m = 0.0;
    double clip_A = 0.0;        // amplifier saturation (0 = none)
    double noise_A = 2.0 * pA;
};

curve_sweep make_curve(const family& f, std::uint64_t seed) {
    std::mt19937_64 rng(seed);
    std::normal_distribution<double> normal(0.0, 1.0);
    std::uniform_real_distribution<double> uniform(f.jitter_low_m, f.jitter_high_m);
    const double jitter = f.jitter_high_m > 0.0 ? uniform(rng) : 0.0;
    curve_sweep s;
    s.direction = sweep_direction::retract;
    for (int k = 0; k < f.points; ++k) {
        const double z = f.z_last_m * k / (f.points - 1);
        const double dz = jitter > 0.0 ? jitter * normal(rng) : 0.0;
        double i = f.i0_A * std::exp(-2.0 * true_kappa * (z + dz)) + f.offset_A + f.noise_A * normal(rng);
        if (f.clip_A > 0.0) i = std::min(i, f.clip_A);
        s.z_m.push_back(z);
        s.current_A.push_back(i);
    }
    return s;
}

struct family_stats {
    double coverage = 0.0, z_spread = 0.0, mean_chi2 = 0.0;
};

family_stats run_family(const family& f, std::uint64_t seed0) {
    int covered = 0;
    double sz = 0.0, szz = 0.0, schi = 0.0;
    for (int k = 0; k < curves_per_family; ++k) {
        const fit_result r = fit_sweep(make_curve(f, seed0 + static_cast<std::uint64_t>(k)),
                                       std::numeric_limits<double>::quiet_NaN(), fit_options{});
        covered += r.decay_constant_ci_low_per_m <= true_kappa && true_kappa <= r.decay_constant_ci_high_per_m;
        const double z = (r.decay_constant_per_m - true_kappa) / r.decay_constant_stderr_per_m;
        sz += z;
        szz += z * z;
        schi += r.reduced_chi_square;
    }
    const double n = curves_per_family;
    family_stats out;
    out.coverage = covered / n;
    out.z_spread = std::sqrt((szz - sz * sz / n) / (n - 1.0));
    out.mean_chi2 = schi / n;
    std::printf("%-12s coverage %.3f  z spread %.3f  mean chi2/dof %.3f\n", f.name.c_str(), out.coverage, out.z_spread,
                out.mean_chi2);
    return out;
}

void expect_honest(const family_stats& s, const std::string& name) {
    EXPECT_GE(s.coverage, 0.92) << name;
    EXPECT_GE(s.z_spread, 0.85) << name;
    EXPECT_LE(s.z_spread, 1.15) << name;
}

}  // namespace

TEST(coverage, white_noise) {
    const family_stats s = run_family({.name = "white"}, 10000);
    expect_honest(s, "white");
    EXPECT_LE(s.coverage, 0.98);
    EXPECT_GE(s.mean_chi2, 0.9);
    EXPECT_LE(s.mean_chi2, 1.1);
}

TEST(coverage, positive_offset) { expect_honest(run_family({.name = "+3 pA", .offset_A = 3.0 * pA}, 20000), "+3 pA"); }

TEST(coverage, negative_offset) { expect_honest(run_family({.name = "-3 pA", .offset_A = -3.0 * pA}, 30000), "-3 pA"); }

// Gap jitter of 1-3 pm: noise proportional to the current, ε = 2κ σ_z = 0.02-0.065.
TEST(coverage, gap_jitter) {
    expect_honest(run_family({.name = "jitter 1-3pm", .jitter_low_m = 1e-12, .jitter_high_m = 3e-12}, 40000), "jitter");
}

TEST(coverage, few_points) { expect_honest(run_family({.name = "16 points", .points = 16}, 50000), "16 points"); }

// Half of the curve lies in the noise floor.
TEST(coverage, noise_floor) { expect_honest(run_family({.name = "floor", .z_last_m = 1.0 * nm}, 60000), "floor"); }

// The first ~15 points clipped at 1 nA (detected as a flat top and left out).
TEST(coverage, saturation) {
    expect_honest(run_family({.name = "saturated", .i0_A = 5e3 * pA, .clip_A = 1e3 * pA}, 70000), "saturated");
}
