// Tip geometry: the paraboloid integral (analytic exponential case and an independent direct
// integration of the model), the conductance quantum and the contact-anchored area.
#include <gtest/gtest.h>

#include <boost/math/quadrature/exp_sinh.hpp>
#include <cmath>
#include <limits>
#include <numbers>

#include "tipgap/config/config.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/current.hpp"
#include "tipgap/model/geometry.hpp"

using namespace tipgap;

namespace {
constexpr double pi = std::numbers::pi;

model_options tungsten_gold(double rel_tol) {
    model_options m = default_config().model;
    m.rel_tol = rel_tol;
    return m;
}
}  // namespace

// Pure exponential J(s) = J0 e^(-2 kappa s) under a paraboloid of apex radius R (local gap
// s + r^2/2R):
//   I = ∫_0^∞ J0 e^(-2 kappa (s + r^2/2R)) 2 pi r dr = J(s) ∫_0^∞ e^(-(kappa/R) r^2) 2 pi r dr
//     = J(s) pi / (kappa/R) = pi R J(s) / kappa,
// using ∫_0^∞ e^(-a r^2) 2r dr = [-e^(-a r^2)/a]_0^∞ = 1/a (derived here; exact).
TEST(geometry, paraboloid_of_an_exponential_is_pi_R_J_over_kappa) {
    for (double rel_tol : {1e-6, 1e-10})
        for (double kappa_per_nm : {5.0, 10.0, 20.0})
            for (double R_nm : {1.0, 10.0, 100.0})
                for (double s_nm : {0.3, 0.8, 2.0}) {
                    const double kappa = kappa_per_nm * 1e9, R = R_nm * 1e-9, s = s_nm * 1e-9;
                    auto j = [&](double gap) { return 1e12 * std::exp(-2.0 * kappa * gap); };
                    const double exact = pi * R * j(s) / kappa;
                    // The integral must meet the requested relative accuracy.
                    EXPECT_NEAR(paraboloid_integral(j, R, s, rel_tol) / exact, 1.0, rel_tol)
                        << "kappa " << kappa_per_nm << "/nm, R " << R_nm << " nm, s " << s_nm << " nm";
                }
}

// total_current for a paraboloid against an independent integration done here: the original radial
// form ∫_0^∞ J(s + r^2/2R) 2 pi r dr with Boost's exp_sinh rule (double-exponential quadrature on a
// half line; Tanaka, Sugihara, Murota & Mori 2009, Numer. Math. 111, 631) on a J computed to 1e-11.
TEST(geometry, paraboloid_total_current_matches_direct_radial_integration) {
    const model_options reference_model = tungsten_gold(1e-11);
    geometry_options g;
    g.kind = geometry_kind::paraboloid;
    g.apex_radius_m = 5e-9;  // R only scales the integral (2 pi r dr = 2 pi R du); the exponential test varies it
    // 8 V at 0.5 nm puts the collapse of the barrier (a kink in J) inside the integration range.
    for (double V : {0.1, -0.5, 8.0})
        for (double s_nm : {0.5, 1.0}) {
            const double s = s_nm * 1e-9;
            // r in nm so the rule sees O(1) abscissae; 2 pi r dr in m^2.
            auto radial = [&](double r_nm) {
                const double r = r_nm * 1e-9;
                return current_density(reference_model, s + r * r / (2.0 * g.apex_radius_m), V) * 2.0 * pi * r * 1e-9;
            };
            boost::math::quadrature::exp_sinh<double> rule;
            const double direct = rule.integrate(radial, 0.0, std::numeric_limits<double>::infinity(), 1e-10);
            for (double rel_tol : {1e-6, 1e-9}) {
                // The library's J carries a relative error up to rel_tol at each node and the
                // integration adds at most rel_tol: 3 rel_tol bounds the difference from the reference.
                const double tolerance = 3.0 * rel_tol;
                EXPECT_NEAR(total_current(tungsten_gold(rel_tol), g, s, V) / direct, 1.0, tolerance)
                    << "tol " << rel_tol << ", V " << V << ", s " << s_nm << " nm";
            }
        }
}

// The sample bias sets the direction of the current for every geometry.
TEST(geometry, paraboloid_current_has_the_sign_of_the_bias) {
    const model_options m = tungsten_gold(1e-6);
    geometry_options g;
    g.kind = geometry_kind::paraboloid;
    EXPECT_GT(total_current(m, g, 0.6e-9, 0.1), 0.0);
    EXPECT_LT(total_current(m, g, 0.6e-9, -0.1), 0.0);
}

// G0 = 2 e^2 / h with the exact SI 2019 values of e and h; CODATA 2018 lists
// G0 = 7.748 091 729... × 10^-5 S (NIST, physics.nist.gov/cgi-bin/cuu/Value?conqu2e2sh).
TEST(geometry, conductance_quantum_codata_2018) {
    const double e = 1.602176634e-19, h = 6.62607015e-34;  // CODATA 2018, exact
    EXPECT_DOUBLE_EQ(si::conductance_quantum, 2.0 * e * e / h);
    // CODATA quotes 10 digits: 7.748091729e-5 S, so agree to 1e-9 relative.
    EXPECT_NEAR(si::conductance_quantum / 7.748091729e-5, 1.0, 1e-9);
}

// contact_anchored: G = G0 at the contact distance, and the gap dependence is the model's J.
TEST(geometry, contact_anchored_gives_g0_at_the_contact_distance) {
    const model_options m = tungsten_gold(1e-9);
    for (double sc_nm : {0.2, 0.25, 0.3}) {
        geometry_options g;
        g.kind = geometry_kind::contact_anchored;
        g.contact_distance_m = sc_nm * 1e-9;
        const double dV = 1e-3;
        // The anchor is defined at 1 mV; agreement is to the model tolerance (same J, same point).
        EXPECT_NEAR(total_current(m, g, g.contact_distance_m, dV) / dV / si::conductance_quantum, 1.0, 1e-12);
        // Elsewhere the current is J times the same area.
        for (double s : {0.5e-9, 1.0e-9})
            EXPECT_NEAR(total_current(m, g, s, 0.1) / (current_density(m, s, 0.1) * contact_anchored_area(m, g)), 1.0,
                        1e-14);
    }
}

TEST(geometry, planar_is_density_times_area) {
    const model_options m = tungsten_gold(1e-6);
    geometry_options g;
    g.area_m2 = 3e-18;
    EXPECT_DOUBLE_EQ(total_current(m, g, 0.7e-9, 0.2), 3e-18 * current_density(m, 0.7e-9, 0.2));
}
