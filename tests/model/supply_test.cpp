// The Fermi-Dirac supply function of the Tsu-Esaki current (its T = 0 limit and small-T behaviour).
#include <gtest/gtest.h>

#include <cmath>

#include "tipgap/core/constants.hpp"
#include "tipgap/model/current.hpp"

using namespace tipgap;

namespace {
constexpr double eV = si::electron_volt;
}  // namespace

TEST(supply_function, zero_temperature_limit_and_smoothness) {
    const double V = 0.1 * eV;
    // T = 0: eV below both Fermi levels, -E between them, 0 above (exact, no division by zero).
    EXPECT_EQ(supply_function(-1.0 * eV, V, 0.0), V);
    EXPECT_DOUBLE_EQ(supply_function(-0.04 * eV, V, 0.0), 0.04 * eV);
    EXPECT_EQ(supply_function(0.2 * eV, V, 0.0), 0.0);
    // Small T tends to the T = 0 value away from the edges, and is positive above them.
    const double kT = si::boltzmann_k * 4.2;
    EXPECT_NEAR(supply_function(-0.05 * eV, V, kT) / (0.05 * eV), 1.0, 1e-12);
    EXPECT_GT(supply_function(0.001 * eV, V, kT), 0.0);
    // Negative bias: the supply changes sign (electrons flow from sample to tip).
    EXPECT_LT(supply_function(-1.0 * eV, -V, kT), 0.0);
    // Exactly at the tip edge at finite T: kT [ln 2 - ln(1 + e^(-eV/kT))] (direct evaluation).
    EXPECT_NEAR(supply_function(0.0, V, kT), kT * (std::log(2.0) - std::log1p(std::exp(-V / kT))), 1e-30);
}
