// The physical constants (CODATA 2018) and the STM rules of thumb derived from them.
#include <gtest/gtest.h>

#include <cmath>

#include "tipgap/core/constants.hpp"

using namespace tipgap;

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
