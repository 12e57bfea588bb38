// Figures of `map` (issue 15): the colour range the user asks for, the standard-error map in meV,
// the quality map with one colour band per code.
#include <gtest/gtest.h>

#include <cmath>
#include <variant>

#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/figures/map_figures.hpp"

using namespace tipgap;

namespace {

constexpr double eV = si::electron_volt;
// Values go through one multiplication and one division by eV: a few ulps.
constexpr double kRounding = 1e-12;

// A 3 x 2 map with one pixel without a value.
barrier_map small_map() {
    barrier_map m;
    m.nx = 3;
    m.ny = 2;
    m.grid.x_m = {0.0, 1e-9, 2e-9};
    m.grid.y_m = {0.0, 1e-9};
    m.apparent_barrier_J = {4.0 * eV, 4.1 * eV, 4.2 * eV, 3.0 * eV, NAN, 4.4 * eV};
    m.apparent_barrier_stderr_J = {0.002 * eV, 0.003 * eV, 0.004 * eV, 0.005 * eV, NAN, 0.007 * eV};
    m.quality = {pixel_quality::ok, pixel_quality::ok, pixel_quality::saturated, pixel_quality::contact,
                 pixel_quality::too_few_points, pixel_quality::poor_fit};
    m.barrier = summarize(m.apparent_barrier_J);
    return m;
}

}  // namespace

TEST(map_figures, range_sets_the_barrier_colour_scale) {
    const barrier_map m = small_map();
    map_figure_options o;
    o.barrier_min_J = 3.5 * eV;
    o.barrier_max_J = 4.5 * eV;
    const plot::figure f = barrier_map_figure(m, o);
    const auto& p = std::get<plot::colour_map_panel>(f.panels.at(0));
    EXPECT_NEAR(*p.z_min, 3.5, kRounding);
    EXPECT_NEAR(*p.z_max, 4.5, kRounding);
    // Default: the 1st and 99th percentiles of the pixels.
    const plot::figure d = barrier_map_figure(m);
    const auto& q = std::get<plot::colour_map_panel>(d.panels.at(0));
    EXPECT_NEAR(*q.z_min, m.barrier.percentiles[0] / eV, kRounding);
    EXPECT_NEAR(*q.z_max, m.barrier.percentiles[5] / eV, kRounding);
}

TEST(map_figures, reversed_range_is_refused_with_its_key) {
    map_figure_options o;
    o.barrier_min_J = 4.5 * eV;
    o.barrier_max_J = 3.5 * eV;
    try {
        o.validate();
        FAIL() << "no error";
    } catch (const error& e) {
        EXPECT_EQ(e.where().key, "range");
        EXPECT_EQ(e.detail(), "MIN must be below MAX; got 4.5..3.5 eV");
    }
    map_figure_options half;
    half.barrier_min_J = 4.0 * eV;
    EXPECT_THROW(half.validate(), error);
}

TEST(map_figures, stderr_map_in_meV_and_quality_map_in_code_bands) {
    const barrier_map m = small_map();
    const plot::figure sf = stderr_map_figure(m), qf = quality_map_figure(m);
    const auto& s = std::get<plot::colour_map_panel>(sf.panels.at(0));
    EXPECT_EQ(s.colour_bar_label, "standard error [meV]");
    EXPECT_NEAR(s.z.at(1), 3.0, kRounding);
    EXPECT_TRUE(std::isnan(s.z.at(4)));
    const auto& q = std::get<plot::colour_map_panel>(qf.panels.at(0));
    EXPECT_EQ(q.z, (std::vector<double>{0, 0, 2, 3, 1, 4}));
    EXPECT_DOUBLE_EQ(*q.z_min, -0.5);
    EXPECT_DOUBLE_EQ(*q.z_max, 5.5);
    // Five codes present: too long for the panel, so the title points to the code table.
    EXPECT_EQ(q.title, "quality code per pixel (0 ok; the README lists the codes)");
    barrier_map few = m;
    few.quality = {pixel_quality::ok, pixel_quality::ok, pixel_quality::missing, pixel_quality::ok, pixel_quality::ok,
                   pixel_quality::ok};
    EXPECT_EQ(std::get<plot::colour_map_panel>(quality_map_figure(few).panels.at(0)).title, "quality: 0 ok, 5 missing");
}
