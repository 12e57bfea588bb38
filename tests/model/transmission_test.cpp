// WKB exponent: the Gauss-Legendre rule on the u^2-mapped halves against Boost's tanh-sinh
// quadrature (a different method that handles the square-root end points on its own), and the
// trapezoid closed form.
#include <gtest/gtest.h>

#include <boost/math/quadrature/tanh_sinh.hpp>
#include <cmath>

#include "model/detail/wkb_core.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/transmission.hpp"

using namespace tipgap;

namespace {
model_options junction(image_kind k) {
    model_options o;
    o.tip = {"", 4.5 * si::electron_volt, 9.0 * si::electron_volt};
    o.sample = {"", 5.3 * si::electron_volt, 5.5 * si::electron_volt};
    o.image = k;
    return o;
}

double reference_exponent(const barrier& b, double E) {
    double x1 = 0, x2 = 0;
    if (!b.forbidden_interval(E, x1, x2)) return 0.0;
    boost::math::quadrature::tanh_sinh<double> ts;
    auto f = [&](double x) {
        double v = b.potential_J(x) - E;
        return v > 0 ? std::sqrt(v) : 0.0;
    };
    return detail::wkb_prefactor() * ts.integrate(f, x1, x2, 1e-15);
}
}  // namespace

// Tolerances: the 30-point rule (abs_tol < 1e-7) reaches 1e-10 absolute over s <= 5 nm; the 20-point
// rule (default tolerance) 1e-7, which is 0.1 of the default relative accuracy of J.
TEST(transmission, exponent_matches_tanh_sinh_over_the_domain) {
    for (image_kind k : {image_kind::exact, image_kind::approximate}) {
        auto o = junction(k);
        for (double s : {0.3e-9, 0.6e-9, 1e-9, 2e-9, 5e-9})
            for (double V : {-3.0, 0.1, 3.0, 8.0})
                for (double e : {-4.0, -1.0, 0.0, 1.0}) {
                    barrier b(o, s, V);
                    double E = e * si::electron_volt;
                    double ref = reference_exponent(b, E);
                    EXPECT_NEAR(wkb_exponent(b, E, 1e-10), ref, 1e-10 + 1e-12 * ref) << s << " " << V << " " << e;
                    EXPECT_NEAR(wkb_exponent(b, E, 1e-7), ref, 1e-7) << s << " " << V << " " << e;
                }
    }
}

// Trapezoid without image force: closed form (2/3) L (u1 + sqrt(u1 u2) + u2)/(sqrt u1 + sqrt u2)
// against tanh-sinh.
TEST(transmission, trapezoid_closed_form) {
    auto o = junction(image_kind::none);
    for (double s : {0.5e-9, 1.5e-9})
        for (double V : {-2.0, 0.0, 0.5, 6.0}) {
            barrier b(o, s, V);
            for (double e : {-3.0, 0.0, 2.0}) {
                double E = e * si::electron_volt;
                double ref = reference_exponent(b, E);
                EXPECT_NEAR(wkb_exponent(b, E), ref, 1e-9 * std::max(1.0, ref));
            }
        }
}

TEST(transmission, above_the_top_is_transparent) {
    auto o = junction(image_kind::exact);
    barrier b(o, 0.6e-9, 0.1);
    EXPECT_EQ(wkb_transmission(b, b.top_J() + 1e-22), 1.0);
    EXPECT_LT(wkb_transmission(b, b.top_J() - 0.5 * si::electron_volt), 1.0);
    // Concave image-lowered barrier: the top lies strictly inside the gap.
    EXPECT_GT(b.top_x_m(), 0.0);
    EXPECT_LT(b.top_x_m(), 0.6e-9);
    EXPECT_NEAR(b.slope_J_per_m(b.top_x_m()) * 1e-9 / si::electron_volt, 0.0, 1e-9);
}
