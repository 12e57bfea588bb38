// Tests for quantity parsing and unit conversion.
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

// The energy and conductance unit factors are the constants themselves, bit for bit: 1 eV =
// 1.602176634e-19 J, 1 meV and 1 keV its exact decimal multiples, and G0 = 2e²/h =
// 7.748091729863649e-05 S in double precision (CODATA 2018; e and h exact). Guards the factors
// taken from tipgap/core/constants.hpp instead of literals in the unit table.
TEST(units, energy_and_conductance_factors_are_the_constants) {
    EXPECT_EQ(parse_quantity("1 eV", dimension::energy), 1.602176634e-19);
    EXPECT_EQ(parse_quantity("1 meV", dimension::energy), 1.602176634e-22);
    EXPECT_EQ(parse_quantity("1 keV", dimension::energy), 1.602176634e-16);
    EXPECT_EQ(parse_quantity("1 G0", dimension::conductance), 7.748091729863649e-05);
    EXPECT_EQ(parse_quantity("1 G0", dimension::conductance), si::conductance_quantum);
}
