// Tests for the I(z) fitter: ground-truth recovery and interval coverage on seeded synthetic
// curves, noise floor, saturation, contact and sweep handling, and curves that once crashed it.
#include <gtest/gtest.h>

#include "synth/detail/normal_source.hpp"

#include <cmath>
#include <cstdio>
#include <cstdint>
#include <limits>
#include <random>
#include <string>
#include <vector>

#include <fmt/format.h>

#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/fit/fit.hpp"

using namespace tipgap;

namespace {

constexpr double nm = 1e-9;
constexpr double per_nm = 1e9;

using tipgap::detail::normal_source;  // Box-Muller on std::mt19937_64 (lib/src/detail)

struct synthetic {
    double kappa_per_m = 10.0 * per_nm;  // 10/nm: φ_ap = 3.81 eV
    double i0_A = 1e-9;                  // current at z = 0
    double offset_A = 0.0;
    double noise_A = 1e-12;
    double z_first_m = 0.0;
    double z_last_m = 0.5 * nm;
    int points = 101;
    double clip_A = 0.0;                 // amplifier saturation (0 = none)
};

curve_sweep make_sweep(const synthetic& s, std::uint64_t seed) {
    normal_source noise(seed);
    curve_sweep out;
    for (int k = 0; k < s.points; ++k) {
        const double z = s.z_first_m + (s.z_last_m - s.z_first_m) * k / (s.points - 1);
        double i = s.i0_A * std::exp(-2.0 * s.kappa_per_m * z) + s.offset_A + s.noise_A * noise.next();
        if (s.clip_A > 0.0) i = std::min(i, s.clip_A);
        out.z_m.push_back(z);
        out.current_A.push_back(i);
    }
    out.direction = s.z_last_m > s.z_first_m ? sweep_direction::retract : sweep_direction::approach;
    return out;
}

const double no_bias = std::numeric_limits<double>::quiet_NaN();

}  // namespace


TEST(fit, apparent_barrier_matches_rule_of_thumb) {
    // κ = 0.5123 Å⁻¹ sqrt(φ/eV) (common practice, no source), quoted to 4 digits: φ ∝ κ², so
    // compare at 2 × 1e-4 relative.
    constexpr double kFourDigits = 2e-4;
    EXPECT_NEAR(apparent_barrier_from_decay(0.5123e10) / si::electron_volt, 1.0, kFourDigits);
    EXPECT_NEAR(apparent_barrier_from_decay(2.0 * 0.5123e10) / si::electron_volt, 4.0, 4.0 * kFourDigits);
}

TEST(fit, recovers_ground_truth_within_stated_uncertainty) {
    const synthetic s;
    const fit_result r = fit_sweep(make_sweep(s, 42), no_bias, fit_options{});
    EXPECT_EQ(r.status, fit_status::converged);
    // One seeded curve: the estimate must lie within 2 standard errors (a 95 % event for honest
    // errors; the seed is fixed, so the test is deterministic).
    EXPECT_LT(std::abs(r.decay_constant_per_m - s.kappa_per_m), 2.0 * r.decay_constant_stderr_per_m);
    EXPECT_GT(r.decay_constant_stderr_per_m, 0.0);
    // σ_φ = 2 φ σ_κ / κ (first-order propagation of φ ∝ κ²).
    EXPECT_NEAR(r.apparent_barrier_stderr_J,
                2.0 * r.apparent_barrier_J * r.decay_constant_stderr_per_m / r.decay_constant_per_m,
                1e-12 * r.apparent_barrier_stderr_J);
    EXPECT_NEAR(r.length_per_decade_m, std::log(10.0) / (2.0 * r.decay_constant_per_m), 1e-15 * nm);
    // The prefactor is the fitted current at the closest used point.
    EXPECT_NEAR(r.prefactor_A, s.i0_A * std::exp(-2.0 * s.kappa_per_m * r.z_ref_m), 3.0 * r.prefactor_stderr_A);
    EXPECT_TRUE(r.warnings.empty() || r.points_below_floor > 0);
}

// Over 200 seeded curves the 95 % interval must contain the true κ in 90-99 % of them (binomial
// σ at p = 0.95 and n = 200 is 1.5 %, so an honest interval lands in [92, 98] % with ~99 %
// probability; the band leaves room for the t approximation).
TEST(fit, confidence_intervals_are_honest_linear_and_offset) {
    for (fit_model model : {fit_model::linear, fit_model::offset}) {
        synthetic s;
        s.offset_A = model == fit_model::offset ? 3e-12 : 0.0;
        fit_options o;
        o.model = model;
        int covered = 0;
        constexpr int curves = 200;
        for (int k = 0; k < curves; ++k) {
            const fit_result r = fit_sweep(make_sweep(s, 1000 + k), no_bias, o);
            covered += r.decay_constant_ci_low_per_m <= s.kappa_per_m && s.kappa_per_m <= r.decay_constant_ci_high_per_m;
        }
        std::printf("95 %% interval coverage, %s model: %d of %d curves\n", to_string(model), covered, curves);
        EXPECT_GE(covered, 180) << to_string(model);
        EXPECT_LE(covered, 198) << to_string(model);
    }
}

TEST(fit, calibration_uncertainty_adds_in_quadrature_and_t_quantile) {
    synthetic s;
    s.points = 12;
    s.z_last_m = 0.22 * nm;
    fit_options o;
    // The linear model (the calibration term is added by the same code for both models; the
    // linear model's 2 parameters give the 10 degrees of freedom of the reference quantile).
    o.model = fit_model::linear;
    o.noise_floor_A = 1e-15;  // use all 12 points: 10 degrees of freedom
    const curve_sweep sw = make_sweep(s, 7);
    const fit_result plain = fit_sweep(sw, no_bias, o);
    o.calibration_uncertainty = 0.02;
    const fit_result cal = fit_sweep(sw, no_bias, o);
    constexpr double kRoundoff = 1e-12;
    ASSERT_EQ(plain.points_used, 12u);
    EXPECT_EQ(plain.decay_constant_per_m, cal.decay_constant_per_m);
    EXPECT_NEAR(cal.decay_constant_stderr_per_m,
                std::hypot(plain.decay_constant_stderr_per_m, 0.02 * plain.decay_constant_per_m),
                kRoundoff * cal.decay_constant_stderr_per_m);
    EXPECT_EQ(cal.decay_constant_stat_stderr_per_m, plain.decay_constant_stderr_per_m);
    // Student t 0.975 quantile, 10 degrees of freedom: 2.2281388519649385 (SciPy
    // scipy.stats.t.ppf(0.975, 10) as the reference library).
    EXPECT_EQ(cal.degrees_of_freedom, 10.0);
    // Boost.Math inverts the incomplete beta iteratively; here it agrees with SciPy's to ~1e-11.
    constexpr double kQuantile = 1e-10;
    EXPECT_NEAR(cal.t_quantile, 2.2281388519649385, 2.2281388519649385 * kQuantile);
    EXPECT_NEAR(cal.decay_constant_ci_high_per_m - cal.decay_constant_per_m,
                cal.t_quantile * cal.decay_constant_stderr_per_m, kRoundoff * cal.decay_constant_per_m);
    // The φ interval is the image of the κ interval.
    EXPECT_NEAR(cal.apparent_barrier_ci_low_J, apparent_barrier_from_decay(cal.decay_constant_ci_low_per_m),
                kRoundoff * cal.apparent_barrier_J);
}

TEST(fit, noise_estimate_on_a_flat_tail_and_a_clean_tail) {
    synthetic floor_limited;
    floor_limited.points = 1001;
    floor_limited.z_last_m = 1.5 * nm;  // signal below 1 pA beyond 0.35 nm
    floor_limited.noise_A = 2e-12;
    const curve_sweep a = make_sweep(floor_limited, 3);
    const noise_estimate e = estimate_noise(a.z_m, a.current_A);
    EXPECT_TRUE(e.floor_reached);
    // The MAD of 200 differences has ~10 % relative scatter; 25 % is 2.5 of those.
    EXPECT_NEAR(e.current_noise_A, 2e-12, 0.25 * 2e-12);
    EXPECT_NEAR(e.noise_floor_A, 3.0 * e.current_noise_A + std::abs(e.tail_offset_A), 1e-24);

    synthetic clean;  // ends at 2.5 pA, 25 σ above zero
    clean.z_last_m = 0.3 * nm;
    clean.noise_A = 0.1e-12;
    const curve_sweep b = make_sweep(clean, 3);
    const noise_estimate f = estimate_noise(b.z_m, b.current_A);
    EXPECT_FALSE(f.floor_reached);
    EXPECT_NEAR(f.noise_floor_A, 3.0 * f.current_noise_A, 1e-24);
}

// A floor-limited curve: fitting every point biases κ low; the default fit does not.
TEST(fit, noise_floor_respected_by_default) {
    synthetic s;
    s.z_last_m = 1.2 * nm;
    s.points = 121;
    const curve_sweep sw = make_sweep(s, 11);

    std::vector<double> ln_i;
    for (double i : sw.current_A) ln_i.push_back(std::log(std::abs(i)));
    const line_fit all = fit_line(sw.z_m, ln_i);
    const double kappa_all = -0.5 * all.slope;
    EXPECT_LT(kappa_all, 0.5 * s.kappa_per_m) << "an unweighted fit of every point flattens towards the floor";

    // The linear model needs the floor: without it, the weighted fit of every point is biased.
    fit_options everything;
    everything.model = fit_model::linear;
    everything.noise_floor_A = 1e-18;  // effectively no floor: weighted fit of every point
    const fit_result biased = fit_sweep(sw, no_bias, everything);
    EXPECT_LT(biased.decay_constant_per_m, s.kappa_per_m - 3.0 * biased.decay_constant_stderr_per_m);

    // The default offset model fits every point with the noise model (the floor only chooses its
    // starting line).
    const fit_result offset = fit_sweep(sw, no_bias, fit_options{});
    EXPECT_EQ(offset.points_used, 121u);
    EXPECT_LT(std::abs(offset.decay_constant_per_m - s.kappa_per_m), 2.0 * offset.decay_constant_stderr_per_m);

    fit_options linear;
    linear.model = fit_model::linear;
    const fit_result r = fit_sweep(sw, no_bias, linear);
    EXPECT_TRUE(r.noise_floor_estimated);
    EXPECT_GT(r.points_below_floor, 60u);
    EXPECT_LT(std::abs(r.decay_constant_per_m - s.kappa_per_m), 2.0 * r.decay_constant_stderr_per_m);
    EXPECT_EQ(r.warnings.front(), fmt::format("{} of 121 points lie below the noise floor of {:.3g} pA and were not used",
                                              r.points_below_floor, r.noise_floor_A / 1e-12));
}

// Amplifier saturation: a flat top is detected and left out; fitting through it biases κ low.
TEST(fit, saturation_detected_or_given) {
    synthetic s;
    s.i0_A = 100e-9;
    s.clip_A = 10e-9;  // clips the first ln(10)/(2κ) = 0.115 nm: 24 points
    const curve_sweep sw = make_sweep(s, 5);
    std::vector<double> ln_i;
    for (double i : sw.current_A) ln_i.push_back(std::log(std::abs(i)));
    const double kappa_through_top = -0.5 * fit_line(sw.z_m, ln_i).slope;
    EXPECT_LT(kappa_through_top, 0.9 * s.kappa_per_m);

    const fit_result r = fit_sweep(sw, no_bias, fit_options{});
    EXPECT_TRUE(r.saturation_detected);
    EXPECT_GE(r.points_saturated, 24u);
    EXPECT_LT(std::abs(r.decay_constant_per_m - s.kappa_per_m), 2.0 * r.decay_constant_stderr_per_m);
    EXPECT_EQ(r.warnings.front().rfind("flat top detected: ", 0), 0u) << r.warnings.front();

    fit_options given;
    given.saturation_A = 9.5e-9;
    const fit_result g = fit_sweep(sw, no_bias, given);
    EXPECT_FALSE(g.saturation_detected);
    EXPECT_EQ(g.saturation_A, 9.5e-9);
    EXPECT_LT(std::abs(g.decay_constant_per_m - s.kappa_per_m), 2.0 * g.decay_constant_stderr_per_m);
}

TEST(fit, offset_model_recovers_decay_and_offset) {
    synthetic s;
    s.offset_A = 5e-12;
    s.z_last_m = 0.8 * nm;
    s.points = 161;
    fit_options o;
    o.model = fit_model::offset;
    const fit_result r = fit_sweep(make_sweep(s, 21), no_bias, o);
    EXPECT_EQ(r.status, fit_status::converged) << r.message;
    EXPECT_EQ(r.points_used, 161u);
    EXPECT_EQ(r.degrees_of_freedom, 158.0);
    EXPECT_LT(std::abs(r.decay_constant_per_m - s.kappa_per_m), 2.0 * r.decay_constant_stderr_per_m);
    EXPECT_LT(std::abs(r.offset_A - s.offset_A), 2.0 * r.offset_stderr_A);
    EXPECT_LT(r.offset_stderr_A, 1e-12);
}

namespace {
// Approach curve with a point contact: tunnelling down to z_contact, then n_contact points at
// G ≈ g_contact G0 (1 % noise), sorted as an approach (z decreasing). Bias 0.1 V.
constexpr double contact_bias_V = 0.1;
curve_sweep contact_sweep(double z_contact_m, int n_contact, double g_contact, bool flat) {
    synthetic s;
    s.i0_A = 0.05 * si::conductance_quantum * contact_bias_V * std::exp(2.0 * s.kappa_per_m * z_contact_m);
    s.z_first_m = 0.5 * nm;
    s.z_last_m = z_contact_m;
    s.points = 81;
    curve_sweep sw = make_sweep(s, 9);
    normal_source noise(10);
    const double dz = (s.z_first_m - s.z_last_m) / (s.points - 1);
    for (int k = 1; k <= n_contact; ++k) {
        const double z = z_contact_m - k * dz;
        const double g = flat ? g_contact : g_contact * std::exp(-2.0 * s.kappa_per_m * (z - z_contact_m + dz));
        sw.z_m.push_back(z);
        sw.current_A.push_back(g * si::conductance_quantum * contact_bias_V * (1.0 + 0.01 * noise.next()));
    }
    sw.direction = sweep_direction::approach;
    return sw;
}
}  // namespace

TEST(fit, contact_plateau_gives_absolute_gap) {
    const double z_contact = 0.1 * nm;
    const curve_sweep sw = contact_sweep(z_contact, 6, 1.0, true);
    const double dz = sw.z_m[0] - sw.z_m[1];
    const fit_result r = fit_sweep(sw, contact_bias_V, fit_options{});
    EXPECT_EQ(r.contact.kind, contact_kind::plateau);
    EXPECT_EQ(r.contact.points_in_contact, 6u);
    // Midpoint between the last contact point and the first tunnelling point.
    EXPECT_NEAR(r.contact.z_m, z_contact - 0.5 * dz, 1e-6 * nm);
    EXPECT_NEAR(r.contact.gap_offset_m, 0.25 * nm - r.contact.z_m, 1e-18);
    EXPECT_NEAR(r.contact.conductance_G0, 1.0, 0.02);
    EXPECT_LT(std::abs(r.decay_constant_per_m - 10.0 * per_nm), 2.0 * r.decay_constant_stderr_per_m);
    ASSERT_FALSE(r.profile.empty());
    EXPECT_NEAR(r.profile.front().gap_m, r.profile.front().z_m + r.contact.gap_offset_m, 1e-18);
}

TEST(fit, contact_jump_with_and_without_bias) {
    const double z_contact = 0.1 * nm;
    // Contact side still steep (not a plateau) after a factor-20 jump from 0.05 G0.
    const curve_sweep steep = contact_sweep(z_contact, 5, 1.0, false);
    const fit_result r = fit_sweep(steep, contact_bias_V, fit_options{});
    EXPECT_EQ(r.contact.kind, contact_kind::jump);
    EXPECT_EQ(r.contact.points_in_contact, 5u);
    EXPECT_GT(r.contact.conductance_G0, 0.5);
    EXPECT_LT(std::abs(r.decay_constant_per_m - 10.0 * per_nm), 2.0 * r.decay_constant_stderr_per_m);

    // Without a bias the plateau cannot be recognised by its conductance; the jump still can.
    const fit_result nb = fit_sweep(contact_sweep(z_contact, 6, 1.0, true), no_bias, fit_options{});
    EXPECT_EQ(nb.contact.kind, contact_kind::jump);
    EXPECT_TRUE(std::isnan(nb.contact.conductance_G0));
    bool warned = false;
    for (const auto& w : nb.warnings) warned |= w.find("no bias in the metadata, conductance unknown") != std::string::npos;
    EXPECT_TRUE(warned);

    // A clean curve has no contact.
    EXPECT_EQ(fit_sweep(make_sweep(synthetic{}, 1), contact_bias_V, fit_options{}).contact.kind, contact_kind::none);
}

TEST(fit, approach_and_retract_fitted_separately) {
    // Approach at κ = 10/nm, retract at κ = 9/nm (a tip that changed at the turn).
    synthetic a;
    a.z_first_m = 0.5 * nm;
    a.z_last_m = 0.0;
    synthetic r = {};
    r.kappa_per_m = 9.0 * per_nm;
    const curve_sweep sa = make_sweep(a, 31), sr = make_sweep(r, 32);
    measured_curve c;
    c.file = "pair.csv";
    c.z_m = sa.z_m;
    c.current_A = sa.current_A;
    c.z_m.insert(c.z_m.end(), sr.z_m.begin() + 1, sr.z_m.end());
    c.current_A.insert(c.current_A.end(), sr.current_A.begin() + 1, sr.current_A.end());
    c.sweeps = split_at_turns(c.z_m, c.current_A);
    const std::vector<fit_result> fits = fit_curve(c, fit_options{});
    ASSERT_EQ(fits.size(), 2u);
    EXPECT_EQ(fits[0].direction, sweep_direction::approach);
    EXPECT_EQ(fits[1].direction, sweep_direction::retract);
    EXPECT_LT(std::abs(fits[0].decay_constant_per_m - 10.0 * per_nm), 3.0 * fits[0].decay_constant_stderr_per_m);
    EXPECT_LT(std::abs(fits[1].decay_constant_per_m - 9.0 * per_nm), 3.0 * fits[1].decay_constant_stderr_per_m);
}

TEST(fit, local_profile_is_flat_for_a_pure_exponential) {
    const synthetic s;
    fit_options o;
    // The profile runs over the linear selection (the points above the floor) for either model;
    // with the linear model that is points_used.
    o.model = fit_model::linear;
    o.window_points = 20;
    const fit_result r = fit_sweep(make_sweep(s, 77), no_bias, o);
    ASSERT_EQ(r.profile.size(), r.points_used - 20 + 1);
    for (const profile_point& p : r.profile) {
        EXPECT_EQ(p.points, 20u);
        // 4 σ per window: with ~80 overlapping windows a 3 σ excursion is plausible.
        EXPECT_LT(std::abs(p.decay_constant_per_m - s.kappa_per_m), 4.0 * p.decay_constant_stderr_per_m);
        EXPECT_TRUE(std::isnan(p.gap_m));
    }
    o.window_points = 0;
    o.window_m = 0.1 * nm;
    const fit_result l = fit_sweep(make_sweep(s, 77), no_bias, o);
    ASSERT_FALSE(l.profile.empty());
    EXPECT_EQ(l.profile.front().points, 21u);  // 0.1 nm at 0.005 nm spacing, both ends included
}

TEST(fit, negative_current_fits_like_positive) {
    // Negative bias gives a negative current; the analysis uses |I| (and the offset keeps its sign).
    const synthetic s;
    curve_sweep pos = make_sweep(s, 55), neg = pos;
    for (double& i : neg.current_A) i = -i;
    EXPECT_EQ(fit_sweep(neg, no_bias, fit_options{}).decay_constant_per_m,
              fit_sweep(pos, no_bias, fit_options{}).decay_constant_per_m);
    fit_options o;
    o.model = fit_model::offset;
    const fit_result p = fit_sweep(pos, no_bias, o), n = fit_sweep(neg, no_bias, o);
    EXPECT_NEAR(n.decay_constant_per_m, p.decay_constant_per_m, 1e-9 * p.decay_constant_per_m);
    EXPECT_NEAR(n.offset_A, -p.offset_A, 1e-6 * p.offset_stderr_A);
}

// Regression: a curve of pure noise once counted as saturated, because the flat-top band was
// 2 σ_I wide and several noise maxima fell inside it. The message must not mention saturation.
TEST(fit, too_few_points_above_the_floor_is_an_input_error) {
    synthetic s;
    s.points = 20;
    s.z_first_m = 0.3 * nm;  // I from 2.5 pA down
    s.z_last_m = 0.6 * nm;
    fit_options o;
    o.noise_floor_A = 5e-12;
    try {
        fit_sweep(make_sweep(s, 2), no_bias, o, location{"c.csv", 0, 0, ""});
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(e.kind(), error_kind::input);
        EXPECT_EQ(std::string(e.what()),
                  "c.csv: only 0 of 20 points lie above the noise floor of 5 pA; a fit needs at least 3");
    }
    fit_options bad;
    bad.calibration_uncertainty = 0.7;
    EXPECT_THROW(bad.validate(), error);
}

// tests/bad_inputs/csv/fuzz_wild_outlier.csv (found by fuzz_curve_csv): a z of 7.07 nm among
// 0.0-0.14 nm made the reweighting pass compute weights of exp(+large)^2 = inf, and the SVD of a
// matrix holding inf read out of bounds (SIGSEGV). Now the fit either works or says why.
TEST(error_format, wild_outlier_curve_is_refused_not_crashed) {
    const std::string text =
        "z [nm],current [pA]\n0.00,0.500000\n0.,.910004365\n0.03,0.335160\n0.03,8.274406\n0.04,0.224664\n"
        "0.05,0.183940\n0.06,0.100595\n7.07,0.123298\n0.18,0.100948\n0.09,0.082649\n0.10,0.067668\n"
        "0.11,0.055401\n0.12,0.045359\n0.13,0.037137\n0.1419,0.011185\n";
    const measured_curve c = parse_curve_csv(text, "w.csv");
    try {
        fit_curve(c, fit_options{});
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(e.kind(), error_kind::input);
        // The sweep before the outlier (rows 1-8) rises with z: no decay constant to report (issue 10;
        // before, it was reported negative and the next sweep was refused for its noise floor).
        EXPECT_EQ(std::string(e.what()), "w.csv: retract sweep from row 1: |I| does not fall with z (fitted decay constant "
                                         "-39 /nm): no barrier height can be given; z must grow as the tip retracts (if "
                                         "it grows as the tip approaches, read the file with --flip-z)");
    }
}

// tests/fuzz/seeds/curve_csv/regression_singular_reweight.csv (found by fuzz_curve_csv): the
// reweighting pass left one z with all the weight, the line fit was singular and the report said
// kappa = -0 +- NaN. Now the last well-posed fit is kept and every number is finite.
TEST(error_format, singular_reweighting_keeps_a_finite_fit) {
    const std::string text =
        "z [nm],current [pA]\n0.00,0.500000\n0.,.910004365\n0.03,0.335160\n0.03,8.274406\n0.04,0.224664\n"
        "0.05,0.183940\n0.06,0.108595\n7.07,0.123298\n0.18,0.100948\n0.09,0.082649\n0.20,0.067668\n"
        "0.11,0.055401\n0.12,0.045359\n0.13,0.037137\n0.1419,0.0100\n0.,.910004365\n0.03,0.335160\n"
        "0.03,8.274406\n0.04,01105\n";
    // Sweep by sweep: fit_curve refuses the first sweep's negative decay constant (issue 10), and
    // what this guards is the fit of each sweep.
    const measured_curve c = parse_curve_csv(text, "s.csv");
    ASSERT_EQ(c.sweeps.size(), 2u);
    for (const curve_sweep& s : c.sweeps) {
        const fit_result r = fit_sweep(s, std::nan(""), fit_options{});
        EXPECT_TRUE(std::isfinite(r.decay_constant_per_m));
        EXPECT_TRUE(std::isfinite(r.decay_constant_stderr_per_m));
        EXPECT_GT(r.decay_constant_stderr_per_m, 0.0);
        EXPECT_TRUE(std::isfinite(r.apparent_barrier_ci_high_J));
    }
}
