// Plot layout rules from issue 15: legends off the data, sparse minor ticks on log axes, plain tick
// labels without an exponent line. Checked on the layout the drawer uses, not on pixels.
#include <gtest/gtest.h>

#include <cmath>
#include <utility>
#include <vector>

#include "plot/detail/plot_draw.hpp"

using namespace tipgap::plot;
using namespace tipgap::plot::detail;

TEST(plot_layout, best_legend_takes_a_free_corner) {
    // A falling line from top left to bottom right leaves the top right and bottom left free;
    // the preference order picks top right.
    std::vector<std::pair<double, double>> pts;
    for (int i = 0; i <= 100; ++i) pts.emplace_back(i / 100.0, 1.0 - i / 100.0);
    const legend_placement p = place_legend(pts, {0, 1}, {0, 1}, 0.3, 0.2, legend_position::best);
    EXPECT_EQ(p.corner, legend_position::top_right);
    EXPECT_DOUBLE_EQ(p.y_hi, 1.0);  // no room needed
    // A rising line: the top right is taken, top left is free.
    for (auto& [x, y] : pts) y = x;
    EXPECT_EQ(place_legend(pts, {0, 1}, {0, 1}, 0.3, 0.2, legend_position::best).corner, legend_position::top_left);
}

TEST(plot_layout, best_legend_raises_the_range_when_no_corner_is_free) {
    std::vector<std::pair<double, double>> pts;
    for (int i = 0; i <= 10; ++i)
        for (int j = 0; j <= 10; ++j) pts.emplace_back(i / 10.0, j / 10.0);  // data everywhere
    const double w = 0.3, h = 0.2;
    const legend_placement p = place_legend(pts, {0, 1}, {0, 1}, w, h, legend_position::best);
    ASSERT_TRUE(p.corner == legend_position::top_right || p.corner == legend_position::top_left);
    // In the raised window the legend box (top h of the window) holds no point.
    const double box_bottom = p.y_hi - h * (p.y_hi - 0.0);
    for (const auto& pt : pts) EXPECT_LT(pt.second, box_bottom);
}

TEST(plot_layout, explicit_corner_is_kept) {
    const std::vector<std::pair<double, double>> pts{{0.9, 0.1}};
    const legend_placement p = place_legend(pts, {0, 1}, {0, 1}, 0.3, 0.2, legend_position::bottom_right);
    EXPECT_EQ(p.corner, legend_position::bottom_right);
    EXPECT_DOUBLE_EQ(p.y_hi, 1.0);
}

TEST(plot_layout, layout_of_a_panel_keeps_the_legend_off_its_points) {
    xy_panel p;
    p.y_axis.scale = axis_scale::log10;
    series s;
    for (int i = 0; i <= 40; ++i) {  // a rising curve: the top right would cover it
        s.x.push_back(i * 0.05);
        s.y.push_back(std::pow(10.0, -12.0 + i * 0.2));
    }
    s.label = "rising";
    p.lines.push_back(s);
    const xy_layout lay = layout_xy(p, 200.0, 120.0, 4.2);
    EXPECT_NE(lay.corner, legend_position::top_right);
}

TEST(plot_layout, log_axes_drop_minor_ticks_beyond_three_decades) {
    axis a;
    a.scale = axis_scale::log10;
    EXPECT_NE(box_options(a, 2.0, false).find('s'), std::string::npos);
    EXPECT_EQ(box_options(a, 11.0, false).find('s'), std::string::npos);
    // Linear axes use our own labels ('o') so that PLplot never adds an "(x10ⁿ)" line.
    axis lin;
    EXPECT_NE(box_options(lin, 0.05, true).find('o'), std::string::npos);
}

TEST(plot_layout, tick_labels_are_plain_decimals) {
    // Steps 1, 2, 5 × 10ⁿ (common practice, no source).
    EXPECT_DOUBLE_EQ(tick_step(4.5), 1.0);
    EXPECT_DOUBLE_EQ(tick_step(0.41), 0.1);
    EXPECT_DOUBLE_EQ(tick_step(0.095), 0.02);
    EXPECT_EQ(tick_label(0.02, 0.095), "0.02");
    EXPECT_EQ(tick_label(-0.04, 0.095), "-0.04");
    EXPECT_EQ(tick_label(1e-18, 0.095), "0.00");  // no "-0" or exponent at zero
    EXPECT_EQ(tick_label(-3.0, 4.5), "-3");
    EXPECT_EQ(tick_label(0.005, 0.02), "0.005");
}
