// The lean per-pixel fit used by maps (fit_sweep_fast) against the curve fit (fit_sweep).
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <algorithm>
#include <fmt/format.h>
#include <fstream>
#include <random>
#include <string>
#include <vector>

#include "fit/detail/fit_fast.hpp"
#include "grid/detail/pixel_quality.hpp"
#include "grid/synthetic_grid.hpp"
#include "support/temp_dir.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/grid/grid.hpp"
#include "tipgap/grid/map.hpp"

namespace {

namespace fs = std::filesystem;
using namespace tipgap;
using namespace tipgap_test;

// ---------------------------------------------------------------------------------------------
// fit_sweep_fast against fit_sweep (the SVD line fit) on noisy pixels, including descending z, a
// contact jump and a saturated top. Both solve the same weighted least-squares problem; 1e-12
// relative leaves room for the different rounding of an SVD and of centred sums (~1e-15 here).
constexpr double fast_vs_svd_rtol = 1e-12;

void expect_same(const fit_result& a, const fit_result& b) {
    auto near = [](double x, double y, const char* what) {
        EXPECT_NEAR(x, y, fast_vs_svd_rtol * std::max(std::abs(x), std::abs(y))) << what;
    };
    near(a.decay_constant_per_m, b.decay_constant_per_m, "kappa");
    near(a.decay_constant_stderr_per_m, b.decay_constant_stderr_per_m, "kappa stderr");
    near(a.apparent_barrier_J, b.apparent_barrier_J, "phi");
    near(a.apparent_barrier_stderr_J, b.apparent_barrier_stderr_J, "phi stderr");
    near(a.apparent_barrier_ci_low_J, b.apparent_barrier_ci_low_J, "phi ci low");
    near(a.apparent_barrier_ci_high_J, b.apparent_barrier_ci_high_J, "phi ci high");
    near(a.prefactor_A, b.prefactor_A, "prefactor");
    near(a.prefactor_stderr_A, b.prefactor_stderr_A, "prefactor stderr");
    near(a.r_squared, b.r_squared, "r2");
    near(a.residual_rms_ln, b.residual_rms_ln, "rms ln");
    near(a.residual_rms_A, b.residual_rms_A, "rms A");
    near(a.reduced_chi_square, b.reduced_chi_square, "chi2");
    near(a.current_decades_used, b.current_decades_used, "decades");
    EXPECT_EQ(a.t_quantile, b.t_quantile);
    EXPECT_EQ(a.points_used, b.points_used);
    EXPECT_EQ(a.points_total, b.points_total);
    EXPECT_EQ(a.points_below_floor, b.points_below_floor);
    EXPECT_EQ(a.points_saturated, b.points_saturated);
    EXPECT_EQ(a.noise_floor_A, b.noise_floor_A);
    EXPECT_EQ(a.current_noise_A, b.current_noise_A);
    EXPECT_EQ(a.saturation_A, b.saturation_A);
    EXPECT_EQ(a.z_ref_m, b.z_ref_m);
    EXPECT_EQ(a.contact.kind, b.contact.kind);
    EXPECT_EQ(a.contact.points_in_contact, b.contact.points_in_contact);
    EXPECT_EQ(a.saturation_detected, b.saturation_detected);
    near(a.line.slope, b.line.slope, "line slope");
}

TEST(grid_fit, fast_fit_agrees_with_fit_sweep_on_sample_pixels) {
    grid_spec g;
    g.points = 128;
    std::mt19937_64 rng(5);
    fit_workspace ws;
    fit_options o;
    o.model = fit_model::linear;  // the per-pixel fit is the linear model's
    o.calibration_uncertainty = 0.02;
    for (int k = 0; k < 40; ++k) {
        const double phi = 2.5 + 0.05 * k;
        std::vector<double> pA = pixel_current(g, phi, rng);
        curve_sweep s;
        for (int i = 0; i < g.points; ++i) {
            s.z_m.push_back(g.z_range_nm * i / (g.points - 1) * 1e-9);
            s.current_A.push_back(pA[static_cast<std::size_t>(i)] * 1e-12);
        }
        if (k % 4 == 1) {  // saturated: the amplifier clips at 400 pA, a flat top
            for (double& c : s.current_A) c = std::min(c, 400e-12);
        }
        if (k % 4 == 2) {  // jump to contact: the closest 4 points 30 times higher
            for (int i = 0; i < 4; ++i) s.current_A[static_cast<std::size_t>(i)] *= 30.0;
        }
        // Without a bias the contact test looks at the step alone (no conductance threshold).
        const double bias = k % 4 == 2 ? std::nan("") : 0.1;
        if (k % 4 == 3) {  // an approach sweep: z descending
            std::reverse(s.z_m.begin(), s.z_m.end());
            std::reverse(s.current_A.begin(), s.current_A.end());
        }
        const fit_result ref = fit_sweep(s, bias, o);
        fit_result fast;
        ASSERT_TRUE(fit_sweep_fast(s.z_m, s.current_A, bias, o, ws, fast));
        SCOPED_TRACE(fmt::format("pixel {}", k));
        expect_same(fast, ref);
        if (k % 4 == 1) {
            EXPECT_GT(fast.points_saturated, 0u);
        }
        if (k % 4 == 2) {
            EXPECT_EQ(fast.contact.kind, contact_kind::jump);
        }
    }
}

TEST(grid_fit, too_few_points_is_a_status_not_an_exception) {
    fit_workspace ws;
    fit_result r;
    const std::vector<double> z = {0.0, 1e-10, 2e-10, 3e-10, 4e-10, 5e-10, 6e-10, 7e-10, 8e-10, 9e-10};
    const std::vector<double> flat = {1e-13, -1e-13, 2e-13, 0.0, 1e-13, -2e-13, 1e-13, 0.0, -1e-13, 2e-13};
    EXPECT_FALSE(fit_sweep_fast(z, flat, 0.1, fit_options{}, ws, r));
    EXPECT_LT(r.points_used, 3u);
    EXPECT_EQ(classify_pixel(r, false, map_options{}), pixel_quality::too_few_points);
    EXPECT_THROW(fit_sweep(curve_sweep{sweep_direction::retract, z, flat, 0}, 0.1, fit_options{}), error);
}

}  // namespace
