// The shape of every user-facing message: one printable line, echoed input clipped, and inputs that
// once crashed the fitter (found by tests/fuzz) refused with tipgap::error.
#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include "tipgap/core/error.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/core/units.hpp"

using namespace tipgap;

TEST(error_format, quote_input_clips_long_text_at_a_character_boundary) {
    EXPECT_EQ(quote_input("abc"), "'abc'");
    EXPECT_EQ(quote_input(std::string(61, 'x')), "'" + std::string(60, 'x') + "...'");
    EXPECT_EQ(quote_input(std::string(60, 'x')), "'" + std::string(60, 'x') + "'");
    // "Å" is two bytes (C3 85); a cut after byte 3 of "xxÅÅ" would split the second Å.
    EXPECT_EQ(quote_input("xx\xC3\x85\xC3\x85", 5), "'xx\xC3\x85...'");
}

TEST(error_format, control_bytes_are_shown_not_sent_to_the_terminal) {
    EXPECT_EQ(quote_input("a\x1b[2Jb\n"), "'a\\x1B[2Jb\\x0A'");
    // The error type itself escapes them too, whatever the message was built from (a library's
    // text, a file name).
    error e(error_kind::input, location{"odd\nname.yaml", 2, 1, ""}, "bad\rvalue");
    EXPECT_EQ(std::string(e.what()), "odd\\x0Aname.yaml:2:1: bad\\x0Dvalue");
    EXPECT_EQ(e.detail(), "bad\\x0Dvalue");
}

TEST(error_format, a_ten_megabyte_number_gives_a_short_message) {
    const std::string huge(10'000'000, '7');
    try {
        parse_quantity(huge + " nm", dimension::length, location{"", 0, 0, "--gap"});
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), "--gap: '" + std::string(60, '7') +
                                             "...' is outside the range of a double-precision number; expected a "
                                             "magnitude of 0 or between about 1e-308 and 1e308");
    }
}

TEST(error_format, straight_line_fit_refuses_non_finite_weights) {
    const std::vector<double> x{0, 1, 2, 3}, y{0, -1, -2, -3};
    const std::vector<double> w{1, 1, std::numeric_limits<double>::infinity(), 1};
    EXPECT_THROW(fit_line(x, y, w), error);
    const std::vector<double> zero{0, 0, 0, 0};
    EXPECT_THROW(fit_line(x, y, zero), error);
}

// Exact data y = 2 - 3x: the fit is exact, and scaling every weight by 1e300 (which used to push
// sqrt(w) y towards overflow) changes nothing but the reported residual scale.
TEST(error_format, straight_line_fit_depends_only_on_weight_ratios) {
    const std::vector<double> x{0, 1, 2, 3, 4}, y{2.1, -1.0, -3.9, -7.05, -10.0};
    const std::vector<double> w1{1, 2, 3, 2, 1}, w2{1e300, 2e300, 3e300, 2e300, 1e300};
    const line_fit a = fit_line(x, y, w1), b = fit_line(x, y, w2);
    // Relative agreement of two evaluations of the same formula: rounding only.
    constexpr double kSame = 1e-12;
    EXPECT_NEAR(b.slope, a.slope, std::abs(a.slope) * kSame);
    EXPECT_NEAR(b.intercept, a.intercept, std::abs(a.intercept) * kSame);
    EXPECT_NEAR(b.slope_stderr, a.slope_stderr, a.slope_stderr * kSame);
    EXPECT_NEAR(b.r_squared, a.r_squared, kSame);
    // s = sqrt(Σ w r² / (n - 2)) scales with sqrt of the weights.
    EXPECT_NEAR(b.residual_std, a.residual_std * 1e150, a.residual_std * 1e150 * kSame);
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
