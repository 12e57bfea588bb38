// The default surface model of the exact solver: the image-lowered barrier clamped at the band
// bottom of the nearer electrode (tipgap/model/exact_transmission.hpp).
#include <gtest/gtest.h>

#include <cmath>

#include "support/reference_junction.hpp"
#include "tipgap/config/config.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/exact_transmission.hpp"

using namespace tipgap;

namespace {
constexpr double J_per_eV = si::electron_volt;
}

// Without the image force the trapezoid never dips below a band bottom at these biases: one smooth
// piece, equal to the barrier everywhere.
TEST(surface_potential, image_free_trapezoid_is_not_clamped) {
    model_options o = tipgap_test::reference_junction().model;
    o.image = image_kind::none;
    surface_potential p(o, 1e-9, 2.0);
    ASSERT_EQ(p.pieces().size(), 1u);
    EXPECT_FALSE(p.pieces()[0].clamped);
    EXPECT_EQ(p.pieces()[0].lo_m, 0.0);
    EXPECT_EQ(p.pieces()[0].hi_m, 1e-9);
    for (double x : {0.0, 0.3e-9, 1e-9}) EXPECT_DOUBLE_EQ(p.potential_J(x), p.raw().potential_J(x));
}

// With the image: clamped at -E_F,tip next to the tip and at -eV - E_F,sample next to the sample,
// continuous at both joins, and equal to the image-lowered barrier in between.
TEST(surface_potential, image_barrier_is_clamped_at_each_band_bottom_and_continuous) {
    const model_options o = tipgap_test::reference_junction().model;  // W 4.5/9.0 J_per_eV, Au 5.3/5.5 J_per_eV
    for (double V : {-2.0, 0.1, 3.0, 8.0}) {
        const double s = 1e-9;
        surface_potential p(o, s, V);
        const auto& pc = p.pieces();
        ASSERT_EQ(pc.size(), 3u) << V;
        EXPECT_TRUE(pc[0].clamped);
        EXPECT_FALSE(pc[1].clamped);
        EXPECT_TRUE(pc[2].clamped);
        EXPECT_DOUBLE_EQ(pc[0].value_J, -9.0 * J_per_eV);
        EXPECT_DOUBLE_EQ(pc[2].value_J, -(V + 5.5) * J_per_eV);
        EXPECT_EQ(pc[0].hi_m, pc[1].lo_m);
        EXPECT_EQ(pc[1].hi_m, pc[2].lo_m);
        // Continuity at the joins: the barrier meets the band bottom there (root-finder accuracy).
        EXPECT_NEAR(p.raw().potential_J(pc[1].lo_m), pc[0].value_J, 1e-9 * J_per_eV) << V;
        EXPECT_NEAR(p.raw().potential_J(pc[1].hi_m), pc[2].value_J, 1e-9 * J_per_eV) << V;
        // Near a plane the image term is -e^2/(16 pi eps0 x) (Simmons 1963, J. Appl. Phys. 34, 1793):
        // it reaches phi + E_F ~ 13.5 eV below the vacuum level at x ~ 0.36 eV nm / 13.5 eV ~ 0.027 nm.
        EXPECT_GT(pc[0].hi_m, 0.015e-9);
        EXPECT_LT(pc[0].hi_m, 0.04e-9);
        for (double x : {0.2e-9, 0.5e-9, 0.8e-9}) EXPECT_DOUBLE_EQ(p.potential_J(x), p.raw().potential_J(x));
        EXPECT_DOUBLE_EQ(p.potential_J(0.0), -9.0 * J_per_eV);
        EXPECT_DOUBLE_EQ(p.potential_J(s), -(V + 5.5) * J_per_eV);
    }
}
