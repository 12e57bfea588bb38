// Derivatives of the current density from the same energy integral as J: against Richardson
// differences of the plain J, the parabolic-top limit of the exponent's derivatives, and the
// guarantee that J itself does not depend on what is computed beside it.
#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "model/detail/exponent_sample.hpp"
#include "model/detail/wkb_core.hpp"
#include "tipgap/config/config.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/barrier.hpp"
#include "tipgap/model/current.hpp"
#include "tipgap/model/transmission.hpp"

using namespace tipgap;

namespace {

model_options junction(image_kind image, double T, double rel_tol) {
    model_options o = default_config().model;  // tungsten tip, gold sample
    o.image = image;
    o.temperature_K = T;
    o.rel_tol = rel_tol;
    return o;
}

// Fourth-order central difference (f(-2h) - 8 f(-h) + 8 f(h) - f(2h)) / 12h: truncation O(h^4).
template <class F>
double richardson(const F& f, double x, double h) {
    return (8.0 * (f(x + h) - f(x - h)) - (f(x + 2.0 * h) - f(x - 2.0 * h))) / (12.0 * h);
}

// The reference differences use J at 1e-12. In s they difference ln J (nearly linear) with
// h = 1 pm: truncation ~h^4 f^(5) / 30 and rounding ~1e-12 / (h * 2e10) both stay below 1e-9 of
// the slope (measured: 3e-9 at 0.4 nm next to a collapsing barrier, 1e-11 elsewhere). In V the step
// is 1 mV. The analytic derivatives come from a model at 1e-10, so 1e-7 is a wide margin that
// still catches any missing term (a missing boundary or supply term is >= 1e-4 of the result).
constexpr double kDerivativeTolerance = 1e-7;

std::string where(image_kind image, double T, double V, double s) {
    return std::string(to_string(image)) + ", T " + std::to_string(T) + " K, V " + std::to_string(V) + " V, s " +
           std::to_string(s * 1e9) + " nm";
}

}  // namespace

TEST(current_derivatives, current_density_is_bitwise_the_plain_one) {
    for (image_kind image : {image_kind::exact, image_kind::none, image_kind::approximate})
        for (double V : {0.1, -2.0, 8.0})
            for (double s : {0.3e-9, 0.8e-9}) {
                const model_options o = junction(image, 4.2, 1e-6);
                const double J = current_density(o, s, V);
                EXPECT_EQ(current_density_derivatives(o, s, V, true).current_density_A_per_m2, J) << where(image, 4.2, V, s);
                EXPECT_EQ(current_density_derivatives(o, s, V, false).current_density_A_per_m2, J) << where(image, 4.2, V, s);
            }
}

TEST(current_derivatives, match_richardson_differences_of_j) {
    for (image_kind image : {image_kind::exact, image_kind::none, image_kind::approximate})
        for (double T : {0.0, 4.2, 300.0})
            for (double V : {0.1, -0.5, 2.0, -3.0})
                for (double s : {0.4e-9, 0.7e-9, 1.5e-9}) {
                    const model_options reference = junction(image, T, 1e-12);
                    const current_density_slopes d = current_density_derivatives(junction(image, T, 1e-10), s, V);
                    const double J = current_density(reference, s, V);
                    auto ln_j = [&](double gap) { return std::log(std::abs(current_density(reference, gap, V))); };
                    auto j_of_v = [&](double bias) { return current_density(reference, s, bias); };
                    const double d_ds = J * richardson(ln_j, s, 1e-12), d_dV = richardson(j_of_v, V, 1e-3);
                    EXPECT_NEAR(d.d_ds_A_per_m3 / d_ds, 1.0, kDerivativeTolerance) << where(image, T, V, s);
                    EXPECT_NEAR(d.d_dV_S_per_m2 / d_dV, 1.0, kDerivativeTolerance) << where(image, T, V, s);
                }
}

// The sample's band bottom (E_F 5.5 eV) lies above the tip's (9 eV) for eV < 3.5 eV, so there the
// lower limit of the energy integral is -eV - E_F,sample and moves with V: dJ/dV carries the
// boundary term e D(e_lo) N(e_lo). At small gaps D(e_lo) is not small and the term is a sizeable
// part of dJ/dV; the check below fails without it.
TEST(current_derivatives, bias_derivative_includes_the_moving_band_bottom) {
    const model_options o = junction(image_kind::exact, 4.2, 1e-10), reference = junction(image_kind::exact, 4.2, 1e-12);
    for (double s : {0.2e-9, 0.3e-9}) {
        const double V = 0.5, eV = si::elementary_charge * V;
        const double e_lo = -eV - o.sample.fermi_energy_J;
        ASSERT_GT(e_lo, -o.tip.fermi_energy_J) << "precondition";
        const barrier b(o, s, V);
        const double term = si::tsu_esaki_prefactor * si::elementary_charge * std::exp(-wkb_exponent(b, e_lo)) *
                            supply_function(e_lo, eV, si::boltzmann_k * o.temperature_K);
        auto j_of_v = [&](double bias) { return current_density(reference, s, bias); };
        const double d_dV = richardson(j_of_v, V, 1e-3);
        EXPECT_GT(term / d_dV, 100.0 * kDerivativeTolerance) << "the term must matter for this check to mean anything";
        EXPECT_NEAR(current_density_derivatives(o, s, V).d_dV_S_per_m2 / d_dV, 1.0, kDerivativeTolerance) << s;
    }
}

TEST(zero_bias_conductance, is_the_slope_of_j_at_zero_bias_and_has_the_right_gap_dependence) {
    for (image_kind image : {image_kind::exact, image_kind::none})
        for (double T : {0.0, 4.2, 300.0})
            for (double s : {0.4e-9, 1e-9}) {
                const model_options reference = junction(image, T, 1e-12);
                const zero_bias_conductance g = zero_bias_conductance_density(junction(image, T, 1e-10), s);
                auto j_of_v = [&](double bias) { return current_density(reference, s, bias); };
                const double G = richardson(j_of_v, 0.0, 1e-3);
                EXPECT_NEAR(g.conductance_density_S_per_m2 / G, 1.0, kDerivativeTolerance) << where(image, T, 0, s);
                auto ln_g = [&](double gap) {
                    return std::log(zero_bias_conductance_density(reference, gap).conductance_density_S_per_m2);
                };
                EXPECT_NEAR(g.d_ds_S_per_m3 / (G * richardson(ln_g, s, 1e-12)), 1.0, kDerivativeTolerance)
                    << where(image, T, 0, s);
            }
}

// evaluate_point's decay constant is -1/2 d ln J/ds of the same pass, and its J is current_density.
TEST(evaluate_point, uses_one_pass_for_j_and_its_slopes) {
    const model_options o = junction(image_kind::exact, 4.2, 1e-6);
    for (double V : {0.1, -1.0, 0.0}) {
        const point_quantities p = evaluate_point(o, 0.7e-9, V);
        if (V != 0.0) {
            const current_density_slopes d = current_density_derivatives(o, 0.7e-9, V);
            EXPECT_EQ(p.current_density_A_per_m2, d.current_density_A_per_m2);
            EXPECT_EQ(p.differential_conductance_density_S_per_m2, d.d_dV_S_per_m2);
            EXPECT_EQ(p.decay_constant_per_m, -0.5 * (d.d_ds_A_per_m3 / d.current_density_A_per_m2));
        } else {
            const zero_bias_conductance g = zero_bias_conductance_density(o, 0.7e-9);
            EXPECT_EQ(p.current_density_A_per_m2, 0.0);
            EXPECT_EQ(p.conductance_density_S_per_m2, g.conductance_density_S_per_m2);
            EXPECT_EQ(p.decay_constant_per_m, -0.5 * (g.d_ds_S_per_m3 / g.conductance_density_S_per_m2));
        }
    }
}

// The three moments share the nodes of sqrt_integral, and the first is the same number.
TEST(wkb_moments, first_moment_is_bitwise_sqrt_integral) {
    const model_options o = junction(image_kind::exact, 4.2, 1e-6);
    const barrier b(o, 0.7e-9, 0.3);
    for (double E_eV : {-3.0, -0.5, 0.0}) {
        const double E = E_eV * si::electron_volt;
        double x1 = 0, x2 = 0;
        ASSERT_TRUE(b.forbidden_interval(E, x1, x2));
        auto f = [&](double x) { return b.potential_J(x) - E; };
        const double xm = b.top_x_m();
        EXPECT_EQ(detail::sqrt_integral_moments<20>(f, x1, xm, x2).root, detail::sqrt_integral<20>(f, x1, xm, x2));
        EXPECT_EQ(detail::sqrt_integral_moments<30>(f, x1, xm, x2).root, detail::sqrt_integral<30>(f, x1, xm, x2));
        EXPECT_EQ(detail::wkb_exponent_sample(b, E, 1e-9).theta, wkb_exponent(b, E, 1e-9));
    }
}

// At the barrier top theta vanishes but its derivatives tend to the parabolic-top limit
// (p / 2s)(-W(xm)) pi sqrt(2/|U''|) and -(p e / 2s) xm pi sqrt(2/|U''|). Just below the top the
// exponent's derivatives change linearly with the distance from it: at 1e-6 eV below a top
// several eV high, 1e-5 relative covers that change.
TEST(wkb_exponent_sample, derivatives_tend_to_the_parabolic_top_limit) {
    constexpr double kNearTop = 1e-5;
    for (double V : {0.1, 2.0})
        for (double s : {0.5e-9, 1.5e-9}) {
            const barrier b(junction(image_kind::exact, 4.2, 1e-10), s, V);
            const detail::exponent_sample top = detail::wkb_exponent_at_top(b);
            const detail::exponent_sample near = detail::wkb_exponent_sample(b, b.top_J() - 1e-6 * si::electron_volt, 1e-12);
            EXPECT_EQ(top.theta, 0.0);
            EXPECT_NEAR(near.d_ds_per_m / top.d_ds_per_m, 1.0, kNearTop) << V << " " << s;
            EXPECT_NEAR(near.d_dV_per_V / top.d_dV_per_V, 1.0, kNearTop) << V << " " << s;
        }
}
