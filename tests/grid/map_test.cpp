// Barrier maps from small synthetic grids (tests/grid/synthetic_grid.hpp): the disc pattern is
// recovered, results do not depend on threads, chunking or pixel order, and quality codes.
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
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
#include "tipgap/grid/map_files.hpp"
#include "tipgap/figures/map_directory.hpp"

namespace {

namespace fs = std::filesystem;
using namespace tipgap;
using namespace tipgap_test;

// ---------------------------------------------------------------------------------------------
// The disc pattern is recovered. With Gaussian noise and honest standard errors, 99.7 % of the
// pixels would lie within 3σ; 95 % allows for the σ being estimated from each pixel's own
// residuals (Student t with ~40 degrees of freedom) and for the small bias of fitting ln|I|.
constexpr double within_three_sigma_fraction = 0.95;
// Region means: each pixel has σ_φ ≈ 0.01 eV, a region has ≥ 50 pixels, so the mean is known to
// ~0.002 eV; 0.01 eV also covers the bias of the log fit at the noise floor.
constexpr double region_mean_tolerance_eV = 0.01;

TEST(grid_map, disc_of_lower_barrier_is_recovered) {
    const grid_spec g;
    temp_dir d;
    const std::string path = d.file("disc.csv", grid_text(g));
    const barrier_map m = make_barrier_map(path, options_with(2));
    ASSERT_EQ(m.nx, 16u);
    ASSERT_EQ(m.ny, 16u);
    EXPECT_DOUBLE_EQ(m.pitch_x_m, 1e-9);
    EXPECT_DOUBLE_EQ(m.pitch_y_m, 1e-9);
    EXPECT_TRUE(m.uniform_pitch);
    EXPECT_EQ(m.grid.samples, 16u * 16u * 64u);
    EXPECT_EQ(m.grid.metadata.bias_V.value_or(0.0), 0.1);
    EXPECT_EQ(m.quality_counts[static_cast<int>(pixel_quality::ok)], 256u);
    std::size_t ok = 0, within = 0, n_disc = 0, n_bg = 0;
    double sum_disc = 0.0, sum_bg = 0.0;
    for (int iy = 0; iy < g.ny; ++iy) {
        for (int ix = 0; ix < g.nx; ++ix) {
            const std::size_t k = static_cast<std::size_t>(iy * g.nx + ix);
            if (m.quality[k] != pixel_quality::ok) continue;
            ++ok;
            const double phi = m.apparent_barrier_J[k] / si::electron_volt;
            const double se = m.apparent_barrier_stderr_J[k] / si::electron_volt;
            within += std::abs(phi - truth_eV(g, ix, iy)) <= 3.0 * se;
            (in_disc(g, ix, iy) ? sum_disc : sum_bg) += phi;
            ++(in_disc(g, ix, iy) ? n_disc : n_bg);
        }
    }
    EXPECT_GE(static_cast<double>(within), within_three_sigma_fraction * static_cast<double>(ok));
    ASSERT_GE(n_disc, 50u);
    EXPECT_NEAR(sum_disc / static_cast<double>(n_disc), g.disc_eV, region_mean_tolerance_eV);
    EXPECT_NEAR(sum_bg / static_cast<double>(n_bg), g.background_eV, region_mean_tolerance_eV);
    // The summary: the median lies on the majority (background), min and max near the two levels.
    EXPECT_NEAR(m.barrier.median / si::electron_volt, g.background_eV, 0.05);
    EXPECT_NEAR(m.barrier.min / si::electron_volt, g.disc_eV, 0.1);
    EXPECT_EQ(m.barrier.count, 256u);
}

TEST(grid_map, results_do_not_depend_on_threads_or_chunk_boundaries) {
    const grid_spec g;
    temp_dir d;
    const std::string path = d.file("g.csv", grid_text(g));
    const barrier_map ref = make_barrier_map(path, options_with(1));
    // 4096-byte chunks cut many pixels in two; 3 threads on 2 cores reorder the visits.
    for (auto [threads, chunk] : {std::pair{2, std::size_t{4096}}, std::pair{3, std::size_t{5000}}, std::pair{1, std::size_t{4096}}}) {
        const barrier_map m = make_barrier_map(path, options_with(threads, chunk));
        SCOPED_TRACE(fmt::format("threads {} chunk {}", threads, chunk));
        ASSERT_EQ(m.apparent_barrier_J.size(), ref.apparent_barrier_J.size());
        for (std::size_t k = 0; k < ref.apparent_barrier_J.size(); ++k) {
            EXPECT_EQ(m.apparent_barrier_J[k], ref.apparent_barrier_J[k]) << k;  // bit for bit
            EXPECT_EQ(m.apparent_barrier_stderr_J[k], ref.apparent_barrier_stderr_J[k]) << k;
            EXPECT_EQ(m.quality[k], ref.quality[k]) << k;
        }
        EXPECT_EQ(m.grid.samples, ref.grid.samples);
    }
}

TEST(grid_map, pixels_in_any_order_give_the_same_map) {
    const grid_spec g{4, 3, 32};
    temp_dir d;
    std::mt19937_64 rng(2);
    std::vector<std::string> blocks;
    for (int iy = 0; iy < g.ny; ++iy)
        for (int ix = 0; ix < g.nx; ++ix) blocks.push_back(pixel_rows(g, ix, iy, pixel_current(g, truth_eV(g, ix, iy), rng)));
    const std::string head = "x [nm],y [nm],z [nm],current [pA]\n";
    std::string forward = head, backward = head;
    for (const auto& b : blocks) forward += b;
    for (auto it = blocks.rbegin(); it != blocks.rend(); ++it) backward += *it;
    const barrier_map a = make_barrier_map(d.file("f.csv", forward), options_with(2));
    const barrier_map b = make_barrier_map(d.file("b.csv", backward), options_with(2));
    EXPECT_EQ(a.apparent_barrier_J, b.apparent_barrier_J);
    ASSERT_EQ(a.grid.x_m.size(), 4u);
    for (int k = 0; k < 4; ++k) EXPECT_DOUBLE_EQ(a.grid.x_m[static_cast<std::size_t>(k)], k * 1e-9);
}

TEST(grid_map, contact_and_saturation_get_their_codes) {
    const grid_spec g{6, 5, 64};
    temp_dir d;
    const std::string path = d.file("special.csv", grid_text(g, [](int ix, int iy, std::vector<double>& c) {
        if (ix == 1 && iy == 2) {
            for (double& v : c) v = std::min(v, 600.0);  // flat top: the amplifier clips at 600 pA
        }
        if (ix == 4 && iy == 3) {
            // Jump to contact: 2 µA at 100 mV is 0.26 G0, above the 0.1 G0 a jump must reach.
            for (int i = 0; i < 4; ++i) c[static_cast<std::size_t>(i)] = 2e6;
        }
        if (ix == 0 && iy == 0) {
            for (double& v : c) v = 0.3 * std::sin(v);  // nothing above the floor
        }
    }));
    const barrier_map m = make_barrier_map(path, options_with(2));
    EXPECT_EQ(m.quality[2 * 6 + 1], pixel_quality::saturated);
    EXPECT_EQ(m.quality[3 * 6 + 4], pixel_quality::contact);
    EXPECT_EQ(m.quality[0], pixel_quality::too_few_points);
    EXPECT_TRUE(std::isnan(m.apparent_barrier_J[0]));
    EXPECT_TRUE(std::isfinite(m.apparent_barrier_J[2 * 6 + 1]));  // fitted on the unclipped points
    EXPECT_EQ(m.quality_counts[static_cast<int>(pixel_quality::ok)], 27u);
    EXPECT_EQ(m.barrier.count, 29u);
}

TEST(grid_map, poor_fit_when_the_curve_is_not_one_exponential) {
    fit_result r;
    r.decay_constant_per_m = 1e10;
    r.apparent_barrier_J = 4.0 * si::electron_volt;
    r.apparent_barrier_stderr_J = 0.5 * si::electron_volt;  // 12.5 %
    r.current_decades_used = 3.0;
    const map_options o;
    EXPECT_EQ(classify_pixel(r, true, o), pixel_quality::poor_fit);
    r.apparent_barrier_stderr_J = 0.1 * si::electron_volt;
    EXPECT_EQ(classify_pixel(r, true, o), pixel_quality::ok);
    r.current_decades_used = 0.8;
    EXPECT_EQ(classify_pixel(r, true, o), pixel_quality::poor_fit);
    r.current_decades_used = 3.0;
    r.decay_constant_per_m = -1e10;
    EXPECT_EQ(classify_pixel(r, true, o), pixel_quality::poor_fit);
}

}  // namespace

TEST(grid_map, output_directory_holds_every_file_and_the_summary_reads_the_map) {
    EXPECT_EQ(default_map_directory("scan.csv"), "scan_map");
    EXPECT_EQ(default_map_directory("runs/day2.grid.csv"), "runs/day2.grid_map");
    EXPECT_EQ(default_map_directory("pixels/"), "pixels_map");
    const grid_spec g;
    temp_dir d;
    const map_options o = options_with(2);
    const barrier_map m = make_barrier_map(d.file("disc.csv", grid_text(g)), o);
    const std::string out = d.file("disc_map");
    atomic_directory dir(out, map_file_names());
    write_map_directory(m, o, dir, {.figures = false, .run = {.version = "test", .threads = 2}});
    dir.commit();
    for (const std::string& name : map_file_names()) {
        const bool figure = name.ends_with(".png");
        EXPECT_EQ(std::filesystem::exists(out + "/" + name), !figure) << name;
    }
    std::ifstream in(out + "/summary.json");
    const std::string summary((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    EXPECT_NE(summary.find("\"version\": \"test\""), std::string::npos);
    const std::string text = map_summary_text(m, "out");
    EXPECT_EQ(text.rfind("tipgap map: 16 x 16 pixels, 16384 samples -> out\n  apparent barrier: ", 0), 0u) << text;
    EXPECT_NE(text.find("256 pixels with a value\n  quality: ok 256, "), std::string::npos) << text;
    EXPECT_EQ(text.find("partial grid"), std::string::npos);
}
