// Image potential between two grounded planes: the exact series (digamma closed form) and
// Simmons' approximate form.
#include <gtest/gtest.h>

#include <boost/math/quadrature/gauss_kronrod.hpp>
#include <cmath>
#include <numbers>

#include "model/detail/image_series.hpp"
#include "tipgap/model/barrier.hpp"
#include "tipgap/core/constants.hpp"

using namespace tipgap;

namespace {
// The Chebyshev fit of h(a) is exact to rounding: allow a few hundred ulp of g, whose 1/a terms
// reach 1e3 near the ends of the tested range.
constexpr double kSeriesTol = 1e-12;
}  // namespace

// Method of images, summed directly (independent of the digamma closed form):
// W(x) = -(e^2/(16 pi eps0 K)) [1/x + sum_{n>=1} (1/(ns - x) + 1/(ns + x) - 2/(ns))]
// (standard electrostatics; e.g. Simmons 1963, J. Appl. Phys. 34, 1793, eq. 30).
TEST(image_potential, closed_form_equals_direct_image_sum) {
    const double s = 1e-9, K = 1.0;
    for (double a : {0.05, 0.2, 0.37, 0.5, 0.81, 0.95}) {
        double x = a * s;
        double sum = 1.0 / x;
        const int N = 200000;
        for (int n = 1; n <= N; ++n) sum += 1.0 / (n * s - x) + 1.0 / (n * s + x) - 2.0 / (n * s);
        // Tail of the series: sum_{n>N} 2x^2/(n s)^3 ~ x^2/(N^2 s^3).
        sum += x * x / (static_cast<double>(N) * N * s * s * s);
        double direct = -si::coulomb_e2 / (4.0 * K) * sum;
        EXPECT_NEAR(image_potential_exact(x, s, K) / direct, 1.0, 1e-9) << "a = " << a;
    }
}

TEST(image_potential, chebyshev_fit_matches_boost_digamma) {
    for (int i = 1; i < 1000; ++i) {
        double a = i / 1000.0;
        double ref = detail::image_g_reference(a);
        EXPECT_NEAR(detail::image_g(a), ref, kSeriesTol * std::max(1.0, std::abs(ref))) << "a = " << a;
        // Derivative against a central difference of the reference (step 1e-6: error ~1e-9 relative).
        double h = 1e-6;
        double d = (detail::image_g_reference(a + h) - detail::image_g_reference(a - h)) / (2 * h);
        if (a > 0.01 && a < 0.99) {
            EXPECT_NEAR(detail::image_g_prime(a), d, 1e-6 * std::max(1.0, std::abs(d)));
        }
    }
}

// Limits stated in the design (classical electrostatics, e.g. Simmons 1963 eq. 30 and its discussion):
// near a plane W -> -e^2/(16 pi eps0 K x); at the midpoint W = -e^2 ln2 / (4 pi eps0 K s).
TEST(image_potential, near_plane_and_midpoint_limits) {
    const double s = 1e-9;
    for (double K : {1.0, 2.5}) {
        double x = 1e-6 * s;
        double single_plane = -si::coulomb_e2 / (4.0 * K * x);
        EXPECT_NEAR(image_potential_exact(x, s, K) / single_plane, 1.0, 1e-5);
        double mid = -si::coulomb_e2 * std::numbers::ln2 / (K * s);
        EXPECT_NEAR(image_potential_exact(0.5 * s, s, K) / mid, 1.0, 1e-14);
    }
}

// Simmons 1963 eq. 33 with the SI reading lambda = e^2 ln2 / (16 pi eps0 K s) agrees with the exact
// series to about 2 % in barrier area over [0.1 s, 0.9 s]; the literal reading with 8 pi doubles the
// image term (area ratio ~2.03).
TEST(image_potential, simmons_approximation_area_within_two_percent) {
    const double s = 0.8e-9, K = 1.0;
    using gk = boost::math::quadrature::gauss_kronrod<double, 31>;
    auto exact = [&](double a) { return image_potential_exact(a * s, s, K) / si::electron_volt; };
    auto approx = [&](double a) { return image_potential_approximate(a * s, s, K) / si::electron_volt; };
    double A = gk::integrate(exact, 0.1, 0.9, 10, 1e-12);
    double B = gk::integrate(approx, 0.1, 0.9, 10, 1e-12);
    EXPECT_NEAR(B / A, 1.0, 0.02);
    EXPECT_GT(B / A, 1.01);  // the approximation is ~1.6 % deeper: a real, known difference
    // Literal 8 pi reading: twice our lambda.
    EXPECT_NEAR(2.0 * B / A, 2.03, 0.01);
}
