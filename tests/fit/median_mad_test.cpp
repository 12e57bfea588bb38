// median_and_mad (one sort and a merge of the deviations) gives bit for bit the median and the
// median absolute deviation of two nth_element selections (median_in_place), which the noise
// estimate of every fit used before; odd and even lengths, ties, and skewed values.
#include <gtest/gtest.h>

#include <cmath>
#include <random>
#include <vector>

#include "fit/detail/fit_internal.hpp"

namespace {

using tipgap::detail::median_and_mad;
using tipgap::detail::median_in_place;

TEST(median_mad, equals_two_selections_bit_for_bit) {
    std::mt19937_64 rng(11);
    std::normal_distribution<double> normal(0.0, 1.0);
    int cases = 0;
    for (std::size_t n = 1; n <= 60; ++n) {
        for (int kind = 0; kind < 4; ++kind) {
            std::vector<double> v(n);
            for (double& x : v) {
                if (kind == 0) x = normal(rng);
                if (kind == 1) x = std::round(normal(rng) * 2.0);         // many ties
                if (kind == 2) x = std::exp(3.0 * normal(rng)) * 1e-12;   // skewed, currents in A
                if (kind == 3) x = 1e-9 + 1e-25 * static_cast<double>(rng() % 5);  // near-equal values
            }
            std::vector<double> a = v;
            const double m = median_in_place(a);
            for (double& x : a) x = std::abs(x - m);
            const double mad = median_in_place(a);
            std::vector<double> b = v;
            const auto r = median_and_mad(b);
            EXPECT_EQ(r.median, m) << n << " " << kind;
            EXPECT_EQ(r.mad, mad) << n << " " << kind;
            ++cases;
        }
    }
    EXPECT_EQ(cases, 240);
    // A hand case: 1, 2, 4, 7, 20: median 4, deviations 3, 2, 0, 3, 16 -> MAD 3.
    std::vector<double> h{7, 1, 20, 4, 2};
    const auto r = median_and_mad(h);
    EXPECT_EQ(r.median, 4.0);
    EXPECT_EQ(r.mad, 3.0);
}

}  // namespace
