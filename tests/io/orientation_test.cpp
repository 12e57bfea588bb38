// Which way z runs (io/orientation.hpp), and the readers' refusal of a curve whose |I| rises with
// z unless it is read with flip_z. Curves: I = I0 exp(-2 κ z) (Binnig et al., Appl. Phys. Lett.
// 40, 178 (1982)), κ = 10 /nm, written here.
#include <gtest/gtest.h>

#include <cmath>
#include <fmt/format.h>
#include <string>
#include <vector>

#include "tipgap/core/error.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/io/orientation.hpp"

using namespace tipgap;

namespace {

// n points z = 0 .. span nm, I = 1 nA exp(-2 κ z) with κ = 10 /nm.
void exponential(int n, double span_nm, std::vector<double>& z, std::vector<double>& i) {
    z.clear();
    i.clear();
    for (int k = 0; k < n; ++k) {
        z.push_back(span_nm * 1e-9 * k / (n - 1));
        i.push_back(1e-9 * std::exp(-2.0 * 10e9 * z.back()));
    }
}

std::string curve_text(const std::vector<double>& z, const std::vector<double>& i) {
    std::string t = "z [nm],current [pA]\n";
    for (std::size_t k = 0; k < z.size(); ++k) t += fmt::format("{:.6f},{:.6f}\n", z[k] * 1e9, i[k] * 1e12);
    return t;
}

}  // namespace

TEST(orientation, falling_rising_and_unclear_curves) {
    std::vector<double> z, i;
    exponential(16, 0.4, z, i);
    orientation_check o = check_orientation(z, i);
    EXPECT_EQ(o.orientation, z_orientation::current_falls);
    EXPECT_EQ(o.quarter_points, 4u);
    // Medians of points 0-3 and 12-15: the mean of the middle two, exactly.
    EXPECT_EQ(o.near_median_A, 0.5 * (i[1] + i[2]));
    EXPECT_EQ(o.far_median_A, 0.5 * (i[13] + i[14]));
    // z growing as the tip approaches: the same currents against -z, in either row order.
    std::vector<double> minus_z;
    for (double v : z) minus_z.push_back(-v);
    EXPECT_EQ(check_orientation(minus_z, i).orientation, z_orientation::current_rises);
    std::vector<double> rz(z.rbegin(), z.rend()), ri(i.begin(), i.end());
    EXPECT_EQ(check_orientation(rz, ri).orientation, z_orientation::current_rises);
    // Shuffled rows (not monotonic in z) give the same answer.
    std::vector<double> sz, si;
    for (int k : {3, 9, 0, 15, 7, 12, 1, 14, 5, 10, 2, 13, 8, 4, 11, 6}) {
        sz.push_back(z[k]);
        si.push_back(i[k]);
    }
    EXPECT_EQ(check_orientation(sz, si).orientation, z_orientation::current_falls);
}

TEST(orientation, unclear_without_enough_points_spread_or_ratio) {
    std::vector<double> z, i;
    exponential(11, 0.4, z, i);  // 2 points per quarter: too few
    EXPECT_EQ(check_orientation(z, i).orientation, z_orientation::unclear);
    exponential(16, 0.02, z, i);  // 0.015 nm between the quarters' medians: a factor e^0.3
    EXPECT_EQ(check_orientation(z, i).orientation, z_orientation::unclear);
    std::vector<double> flat(16, 1e-10);
    EXPECT_EQ(check_orientation(flat, i).orientation, z_orientation::unclear);  // no spread in z
    std::vector<double> zero(16, 0.0);
    exponential(16, 0.4, z, i);
    EXPECT_EQ(check_orientation(z, zero).orientation, z_orientation::unclear);  // no current at all
}

TEST(orientation, reader_refuses_a_rising_curve_and_reads_it_with_flip_z) {
    std::vector<double> z, i;
    exponential(40, 0.4, z, i);
    std::vector<double> minus_z;
    for (double v : z) minus_z.push_back(0.4e-9 - v);  // the piezo's extension: grows towards the sample
    const std::string text = curve_text(minus_z, i);
    // The quarters hold 10 points each: the medians are the means of the 5th and 6th currents from
    // either end, as written to 6 decimals in pA.
    auto pA6 = [](double a) { return std::round(a * 1e18) / 1e18; };
    const std::string evidence = fmt::format("median {:.3g} A over the quarter of the points with the largest z, {:.3g} A "
                                             "over the quarter with the smallest",
                                             0.5 * (pA6(i[4]) + pA6(i[5])), 0.5 * (pA6(i[34]) + pA6(i[35])));
    try {
        parse_curve_csv(text, "r.csv");
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(e.kind(), error_kind::input);
        EXPECT_EQ(std::string(e.what()), "r.csv: |I| rises with z (" + evidence +
                                             "): z must grow as the tip retracts; if z in this file grows as the tip "
                                             "approaches, read it with --flip-z");
    }
    reader_options flip;
    flip.flip_z = true;
    const measured_curve c = parse_curve_csv(text, "r.csv", flip);
    EXPECT_EQ(c.z_m.front(), -0.4 * 1e-9);
    ASSERT_EQ(c.sweeps.size(), 1u);
    EXPECT_EQ(c.sweeps[0].direction, sweep_direction::retract);
    // A curve that needs no flip, read with one, is refused the other way round.
    try {
        parse_curve_csv(curve_text(z, i), "f.csv", flip);
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), "f.csv: |I| rises with z (" + evidence +
                                             "): z must grow as the tip retracts; this file was read with --flip-z, "
                                             "which it does not need");
    }
}
