// Current density: published closed forms and limits (Simmons 1963, 1964; Tsu-Esaki supply).
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "tipgap/core/constants.hpp"
#include "tipgap/model/current.hpp"

using namespace tipgap;

namespace {
constexpr double eV = si::electron_volt;

model_options rectangular(double phi_eV, double ef_eV, double T) {
    model_options o;
    o.tip = {"", phi_eV * eV, ef_eV * eV};
    o.sample = {"", phi_eV * eV, ef_eV * eV};
    o.image = image_kind::none;
    o.temperature_K = T;
    return o;
}
}  // namespace

// Rectangular barrier, T = 0, zero-bias limit. With D(E) = exp(-b sqrt(phi - E)), b = 2 s sqrt(2m)/hbar,
// and N(E) -> eV for E < 0: J/V = (4 pi m e^2/h^3) ∫_{-E_F}^{0} exp(-b sqrt(phi - E)) dE. With
// w = sqrt(phi - E), dE = -2w dw, the integral is ∫_{sqrt phi}^{sqrt U} 2 w e^{-b w} dw
// = [-(2w/b + 2/b^2) e^{-bw}] = (2 sqrt(phi)/b + 2/b^2) e^{-b sqrt(phi)} - (2 sqrt(U)/b + 2/b^2) e^{-b sqrt(U)},
// U = phi + E_F (derived here; J is odd in V for identical electrodes, so J/V has no O(V) term and at
// V = 1 uV the O(V^2) terms are below 1e-10).
TEST(current, rectangular_zero_bias_closed_form) {
    for (double s : {0.5e-9, 1e-9, 2e-9})
        for (double phi : {3.0, 4.5, 6.0}) {
            auto o = rectangular(phi, 5.5, 0.0);
            o.rel_tol = 1e-9;
            const double V = 1e-6;
            double b = 2.0 * s * std::sqrt(2.0 * si::electron_mass) / si::hbar;  // J^-1/2
            double p = phi * eV, U = (phi + 5.5) * eV;
            double closed = 4.0 * std::numbers::pi * si::electron_mass * si::elementary_charge * si::elementary_charge /
                            std::pow(si::planck_h, 3) *
                            ((2 * std::sqrt(p) / b + 2 / (b * b)) * std::exp(-b * std::sqrt(p)) -
                             (2 * std::sqrt(U) / b + 2 / (b * b)) * std::exp(-b * std::sqrt(U)));
            EXPECT_NEAR(current_density(o, s, V) / V / closed, 1.0, 1e-6) << "s " << s << " phi " << phi;
        }
}

// Simmons 1963 (J. Appl. Phys. 34, 1793) intermediate-voltage formula at zero bias: the exact
// result above over Simmons' J/V = e^2/(2 pi h s^2) e^{-b sqrt(phi)} (b sqrt(phi)/2 - 1) is
// (1 + 1/(b sqrt phi)) / (1 - 2/(b sqrt phi)), up to the band-bottom term e^{-b sqrt U}
// (relative size e^{-b (sqrt U - sqrt phi)} < 3e-5 for s >= 1 nm), hence 1e-4.
TEST(current, simmons_formula_differs_by_the_known_factor) {
    for (double s : {1e-9, 1.5e-9, 2e-9}) {
        auto o = rectangular(4.5, 5.5, 0.0);
        o.rel_tol = 1e-9;
        const double V = 1e-6;
        double wkb = current_density(o, s, V);
        o.method = method_kind::simmons;
        double simmons = current_density(o, s, V);
        double x = 2.0 * s * std::sqrt(2.0 * si::electron_mass * 4.5 * eV) / si::hbar;  // b sqrt(phi)
        double factor = (1.0 + 1.0 / x) / (1.0 - 2.0 / x);
        EXPECT_NEAR(wkb / simmons / factor, 1.0, 1e-4) << "s " << s;
    }
}

// Simmons 1964 (J. Appl. Phys. 35, 2655): at low bias J(T)/J(0) = pi c kT / sin(pi c kT),
// c = b / (2 sqrt(phi)) for a rectangular barrier. The excess J(T)/J(0) - 1 agrees to 10 %.
TEST(current, temperature_factor_simmons_1964) {
    const double s = 1e-9, phi = 4.5;
    for (double T : {77.0, 300.0}) {
        auto cold = rectangular(phi, 5.5, 0.0);
        auto warm = rectangular(phi, 5.5, T);
        cold.rel_tol = warm.rel_tol = 1e-9;
        const double V = 1e-3;
        double ratio = current_density(warm, s, V) / current_density(cold, s, V);
        double b = 2.0 * s * std::sqrt(2.0 * si::electron_mass) / si::hbar;
        double c = b / (2.0 * std::sqrt(phi * eV));
        double y = std::numbers::pi * c * si::boltzmann_k * T;
        double expected = y / std::sin(y);
        EXPECT_NEAR((ratio - 1.0) / (expected - 1.0), 1.0, 0.10) << "T " << T;
        EXPECT_GT(ratio, 1.0);
    }
}

// Rule of thumb (common practice, no source): for 4-5 eV barriers the current changes about tenfold
// per 0.1 nm. "About" is taken as a factor 6 to 15 (the exact image force lowers the apparent barrier).
TEST(current, about_one_decade_per_tenth_nanometre) {
    for (double phi : {4.0, 4.5, 5.0})
        for (image_kind k : {image_kind::none, image_kind::exact}) {
            auto o = rectangular(phi, 5.5, 4.2);
            o.image = k;
            for (double s : {0.6e-9, 0.8e-9, 1.0e-9}) {
                double r = current_density(o, s, 0.1) / current_density(o, s + 0.1e-9, 0.1);
                EXPECT_GT(r, 6.0) << phi << " " << s;
                EXPECT_LT(r, 15.0) << phi << " " << s;
            }
        }
}

// Sanity over the model's domain: finite, sign of V, decreasing with gap (strictly where a barrier
// exists at both gaps; a collapsed barrier passes everything and may be flat).
TEST(current, sane_over_the_domain) {
    int checked = 0;
    for (double phi : {1.0, 3.0, 5.0, 8.0})
        for (double T : {0.0, 300.0, 1000.0})
            for (double V : {-10.0, -2.0, -0.01, 0.01, 1.0, 5.0, 10.0}) {
                model_options o = rectangular(phi, 6.0, T);
                o.sample.work_function_J = (phi + 0.5) * eV;
                o.image = image_kind::exact;
                double prev = 0;
                for (double s : {0.2e-9, 0.3e-9, 0.5e-9, 0.8e-9, 1.2e-9, 2e-9, 3e-9, 5e-9}) {
                    double j = current_density(o, s, V);
                    ASSERT_TRUE(std::isfinite(j)) << phi << " " << T << " " << V << " " << s;
                    EXPECT_GT(j * V, 0.0) << phi << " " << T << " " << V << " " << s;
                    if (prev != 0) {
                        bool open = classify(o, s, V) != regime::barrier_collapsed;
                        if (open) EXPECT_LT(std::abs(j), std::abs(prev)) << phi << " " << T << " " << V << " " << s;
                        else EXPECT_LE(std::abs(j), std::abs(prev) * (1 + 1e-6));
                    }
                    prev = j;
                    ++checked;
                }
            }
    EXPECT_EQ(checked, 4 * 3 * 7 * 8);
}

TEST(current, regimes) {
    model_options o = rectangular(4.5, 9.0, 4.2);
    o.sample.work_function_J = 5.3 * eV;
    o.image = image_kind::exact;
    EXPECT_EQ(classify(o, 0.8e-9, 0.1), regime::direct_tunnelling);
    EXPECT_EQ(classify(o, 2e-9, 6.0), regime::field_emission);    // eV above the sample's 5.3 eV
    EXPECT_EQ(classify(o, 2e-9, -5.0), regime::field_emission);   // |eV| above the tip's 4.5 eV
    EXPECT_EQ(classify(o, 0.2e-9, 0.1), regime::barrier_collapsed);
}
