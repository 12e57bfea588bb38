// The numerical WKB exponent (tipgap::wkb_exponent_concave) against the published closed form for
// the Schottky-Nordheim barrier of one surface in a field F,
//   U(x) = phi - e F x - e^2/(16 pi eps0 x),
// whose exponent is v(f) b phi^3/2 / F with f = (e^3 F/(4 pi eps0))/phi^2 and
// v = sqrt(1+l) [E(m) - l K(m)], l = sqrt f, m = (1-l)/(1+l) (Forbes & Deane 2007, Proc. R. Soc.
// A 463, 2907; b = 6.830890 eV^-3/2 V nm^-1, Forbes 2006, Appl. Phys. Lett. 89, 113122).
#include <gtest/gtest.h>

#include <cmath>

#include "tipgap/model/closed_forms.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/wkb.hpp"

using namespace tipgap;

namespace {

constexpr double eV = si::elementary_charge;

// Required agreement of the quadrature with the elliptic-integral closed form (issue 2, test 4).
constexpr double kSn = 1e-6;
// Absolute accuracy asked of the WKB exponent (values 5..150 here): 1e-10 absolute is < 1e-11
// relative, far inside kSn, so a failure means a wrong integral, not a loose quadrature.
constexpr double kAbsTol = 1e-10;

// SI second Fowler-Nordheim constant b = (4/3) sqrt(2m)/(e hbar).
double b_si() { return (4.0 / 3.0) * std::sqrt(2.0 * si::electron_mass) / (si::elementary_charge * si::hbar); }

double sn_exponent(double phi_J, double F_V_per_m, double E_J) {
    const double eF = si::elementary_charge * F_V_per_m;
    const double q = si::coulomb_e2 / 4.0;  // e^2/(16 pi eps0), J m
    auto U = [=](double x) { return phi_J - eF * x - q / x; };
    auto dU = [=](double x) { return -eF + q / (x * x); };
    // Beyond x = 2 phi/(eF) the barrier is far below any E used here.
    return wkb_exponent_concave(U, dU, 0.0, 2.0 * phi_J / eF, E_J, kAbsTol);
}

}  // namespace

TEST(sn_barrier, wkb_exponent_equals_v_b_phi32_over_F) {
    for (double phi_eV : {4.5, 5.3}) {
        for (double f : {0.05, 0.1, 0.2, 0.3, 0.5, 0.7, 0.9}) {
            const double phi = phi_eV * eV;
            const double F = f * phi * phi / (si::coulomb_e2 * si::elementary_charge);  // inverts f(F)
            ASSERT_NEAR(scaled_barrier_field(F, phi), f, f * 1e-14);
            const double expected = sn_v_exact(f) * b_si() * std::pow(phi, 1.5) / F;
            const double got = sn_exponent(phi, F, 0.0);
            EXPECT_NEAR(got, expected, expected * kSn) << "phi = " << phi_eV << " eV, f = " << f;
        }
    }
}

// Below the Fermi level the barrier is higher by the depth d: phi -> phi + d in the closed form.
TEST(sn_barrier, wkb_exponent_below_fermi_level) {
    const double phi = 4.5 * eV, F = 3e9;  // 3 V/nm
    for (double d_eV : {0.1, 0.5, 2.0}) {
        const double h = phi + d_eV * eV;
        const double expected = sn_v_exact(scaled_barrier_field(F, h)) * b_si() * std::pow(h, 1.5) / F;
        EXPECT_NEAR(sn_exponent(phi, F, -d_eV * eV), expected, expected * kSn) << "d = " << d_eV << " eV";
    }
}

// Without the image term the barrier is triangular and finite at x = 0, so the forbidden interval
// starts at the domain end: the exponent is exactly b phi^3/2 / F (elementary Fowler-Nordheim,
// Fowler & Nordheim 1928, Proc. R. Soc. A 119, 173; Forbes 2006).
TEST(sn_barrier, triangular_barrier_gives_elementary_fn_exponent) {
    for (double phi_eV : {4.5, 5.3}) {
        for (double F_V_per_nm : {1.0, 3.0, 10.0}) {
            const double phi = phi_eV * eV, F = F_V_per_nm * 1e9, eF = si::elementary_charge * F;
            auto U = [=](double x) { return phi - eF * x; };
            auto dU = [=](double) { return -eF; };
            const double expected = b_si() * std::pow(phi, 1.5) / F;
            EXPECT_NEAR(wkb_exponent_concave(U, dU, 0.0, 2.0 * phi / eF, 0.0, kAbsTol), expected, expected * kSn)
                << phi_eV << " eV, " << F_V_per_nm << " V/nm";
        }
    }
    // No barrier above its top: exponent 0.
    auto U = [](double x) { return 1e-19 - 1e-10 * x; };
    auto dU = [](double) { return -1e-10; };
    EXPECT_EQ(wkb_exponent_concave(U, dU, 0.0, 1e-8, 2e-19, kAbsTol), 0.0);
}
