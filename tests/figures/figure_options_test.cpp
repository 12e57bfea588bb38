// plan and predict figures (issue 15): log current axes clipped at a measurable floor, side panels
// at the bias the user picks.
#include <gtest/gtest.h>

#include <cmath>
#include <variant>

#include "tipgap/config/config.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/figures/figures.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/predict.hpp"

using namespace tipgap;

namespace {

plot::figure wide_gap_prediction(const figure_options& o) {
    const config c = default_config();
    std::vector<double> gaps;
    for (int i = 0; i < 8; ++i) gaps.push_back((0.4 + 0.25 * i) * 1e-9);  // 0.4..2.15 nm: far below 1 fA at the end
    const std::vector<double> biases{0.1};
    std::vector<std::pair<double, double>> pts;
    for (double s : gaps) pts.emplace_back(s, 0.1);
    return predict_figure(c, gaps, biases, predict_points(c, pts, 1), 1, o);
}

}  // namespace

TEST(figure_options, current_axis_starts_at_the_floor) {
    const plot::figure f = wide_gap_prediction({});
    const auto& ig = std::get<plot::xy_panel>(f.panels.at(0));
    ASSERT_EQ(ig.y_axis.scale, plot::axis_scale::log10);
    // The default floor is 1 fA (issue 15): the curve goes below it, so the axis starts there.
    double smallest = 1.0;
    for (double y : ig.lines.at(0).y) smallest = std::min(smallest, y);
    ASSERT_LT(smallest, 1e-15);
    ASSERT_TRUE(ig.y_axis.min.has_value());
    EXPECT_DOUBLE_EQ(*ig.y_axis.min, 1e-15);

    figure_options o;
    o.current_floor_A = 1e-13;
    const plot::figure raised = wide_gap_prediction(o);
    const auto& ig2 = std::get<plot::xy_panel>(raised.panels.at(0));
    EXPECT_DOUBLE_EQ(*ig2.y_axis.min, 1e-13);
}

TEST(figure_options, floor_must_be_positive) {
    figure_options o;
    o.current_floor_A = 0.0;
    try {
        o.validate();
        FAIL() << "no error";
    } catch (const error& e) {
        EXPECT_EQ(e.where().key, "current_floor");
        EXPECT_EQ(e.detail(), "must be a current > 0 A; got 0 A");
    }
}

TEST(figure_options, side_panels_at_the_picked_bias) {
    const config c = default_config();
    std::vector<std::pair<double, double>> sp;
    for (double V : {-1.0, -0.5, 0.5, 1.0, 2.0}) sp.emplace_back(1e-9, V);
    const auto points = plan_setpoints(c, sp, {}, 1);
    figure_options o;
    o.side_bias_V = 0.9;  // nearest planned bias: 1 V
    const plot::figure f = plan_figure(c, points, 1, o);
    const auto& ig = std::get<plot::xy_panel>(f.panels.at(1));
    EXPECT_EQ(ig.title, "Current against gap at 1 V");
    // The marked setpoint is the 1 V one.
    ASSERT_EQ(ig.lines.at(1).x.size(), 1u);
    EXPECT_DOUBLE_EQ(ig.lines[1].x[0], points[3].solution.gap_m * 1e9);
    // Without a pick: the first bias, as before.
    const plot::figure plain = plan_figure(c, points, 1);
    const auto& first = std::get<plot::xy_panel>(plain.panels.at(1));
    EXPECT_EQ(first.title, "Current against gap at -1 V");
}
