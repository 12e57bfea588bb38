// Tests for quantity parsing and CODATA 2018 constants.
#include <gtest/gtest.h>

#include <cmath>

#include "tipgap/core/constants.hpp"
#include "tipgap/core/units.hpp"

using namespace tipgap;

// Relative tolerance for exact decimal unit conversions: a few ulp.
constexpr double kExact = 1e-15;

TEST(units, lengths_in_all_spellings) {
    EXPECT_NEAR(parse_quantity("0.6 nm", dimension::length), 0.6e-9, 0.6e-9 * kExact);
    EXPECT_NEAR(parse_quantity("6 Å", dimension::length), 6e-10, 6e-10 * kExact);
    EXPECT_NEAR(parse_quantity("6 A", dimension::length), 6e-10, 6e-10 * kExact);
    EXPECT_NEAR(parse_quantity("600pm", dimension::length), 6e-10, 6e-10 * kExact);
}

TEST(units, other_dimensions) {
    EXPECT_NEAR(parse_quantity("100 mV", dimension::voltage), 0.1, 0.1 * kExact);
    EXPECT_NEAR(parse_quantity("-1.5V", dimension::voltage), -1.5, 1.5 * kExact);
    EXPECT_NEAR(parse_quantity("1 nA", dimension::current), 1e-9, 1e-9 * kExact);
    EXPECT_NEAR(parse_quantity("20 pA", dimension::current), 20e-12, 20e-12 * kExact);
    EXPECT_NEAR(parse_quantity("4.2 K", dimension::temperature), 4.2, 4.2 * kExact);
    EXPECT_NEAR(parse_quantity("4.5 eV", dimension::energy), 4.5 * 1.602176634e-19, 7.3e-19 * kExact);
    EXPECT_NEAR(parse_quantity("10 nm^2", dimension::area), 10e-18, 10e-18 * kExact);
    EXPECT_DOUBLE_EQ(parse_quantity("2.5", dimension::dimensionless), 2.5);
}

TEST(units, uncertain_values) {
    uncertain a = parse_uncertain("4.5 ± 0.2 eV", dimension::energy);
    EXPECT_NEAR(a.value / eV, 4.5, 1e-14);
    EXPECT_NEAR(a.sigma / eV, 0.2, 1e-14);
    uncertain b = parse_uncertain("10 +- 5 nm", dimension::length);
    EXPECT_NEAR(b.value, 10e-9, 1e-22);
    EXPECT_NEAR(b.sigma, 5e-9, 1e-22);
    uncertain c = parse_uncertain("4.5 eV", dimension::energy);
    EXPECT_EQ(c.sigma, 0.0);
}

TEST(units, errors_name_key_and_dimension) {
    location w{"cfg.yaml", 3, 5, "tip.work_function"};
    try {
        parse_quantity("4.5 nm", dimension::energy, w);
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()),
                  "cfg.yaml:3:5: tip.work_function: unknown unit 'nm' in '4.5 nm'; expected an energy in eV, meV, keV, J");
        EXPECT_EQ(e.kind(), error_kind::input);
    }
    try {
        parse_quantity("0.6", dimension::length, {"", 0, 0, "--gap"});
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), "--gap: '0.6' has no unit; expected a length in m, cm, mm, um, nm, Å (or A), pm");
    }
    EXPECT_THROW(parse_quantity("nan nm", dimension::length), error);
    EXPECT_THROW(parse_quantity("abc", dimension::length), error);
    EXPECT_THROW(parse_quantity("", dimension::length), error);
}

// CODATA 2018 values (NIST, physics.nist.gov/cuu/Constants, 2019 release).
TEST(constants, codata_2018) {
    EXPECT_EQ(si::planck_h, 6.62607015e-34);
    EXPECT_EQ(si::elementary_charge, 1.602176634e-19);
    EXPECT_EQ(si::boltzmann_k, 1.380649e-23);
    EXPECT_EQ(si::electron_mass, 9.1093837015e-31);
    EXPECT_EQ(si::vacuum_permittivity, 8.8541878128e-12);
    EXPECT_NEAR(si::hbar, 1.054571817e-34, 1.054571817e-34 * 1e-9);   // CODATA 2018 hbar
    EXPECT_NEAR(si::conductance_quantum, 7.748091729e-5, 7.748091729e-5 * 1e-9);  // CODATA 2018 G0
}

// Derived STM coefficients (common practice, no source): kappa = 0.5123 Å^-1 sqrt(phi/eV) and
// phi_ap = 0.952 eV Å^2 (d ln I/dz)^2. Quoted to 4 and 3 digits, so compare at that precision.
TEST(constants, stm_rule_coefficients) {
    double kappa_per_A = std::sqrt(2.0 * si::electron_mass * si::electron_volt) / si::hbar * 1e-10;
    EXPECT_NEAR(kappa_per_A, 0.5123, 0.00005);
    double phi_coeff_eV_A2 = si::hbar * si::hbar / (8.0 * si::electron_mass) / si::electron_volt * 1e20;
    EXPECT_NEAR(phi_coeff_eV_A2, 0.952, 0.0005);
}

// de Broglie wavelength of a 1 eV electron: 1.226 nm (textbook value, common practice, no source).
TEST(constants, de_broglie_1eV) {
    double lambda = si::planck_h / std::sqrt(2.0 * si::electron_mass * si::electron_volt);
    EXPECT_NEAR(lambda / 1e-9, 1.226, 0.0005);
}
