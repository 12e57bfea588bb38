// Figures of plan and predict: the panels carry the model's numbers, and the files are real PNG/SVG.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <unistd.h>

#include "tipgap/config/config.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/figures/figures.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/predict.hpp"

using namespace tipgap;
namespace fs = std::filesystem;

namespace {

std::string read_all(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}

fs::path temp_file(const std::string& name) {
    return fs::temp_directory_path() / ("tipgap_figures_test_" + std::to_string(::getpid()) + "_" + name);
}

// PNG signature, ISO/IEC 15948 (PNG specification) section 5.2.
const std::string png_signature("\x89PNG\r\n\x1a\n", 8);

}  // namespace

TEST(figures, plan_trace_panels_and_png) {
    const config c = default_config();
    std::vector<std::pair<double, double>> sp;
    for (double V : {0.1, 0.5, 1.0}) sp.emplace_back(1e-9, V);
    sp.emplace_back(1.0, 0.1);  // unreachable: a hole in the trace, not a failure
    const auto points = plan_setpoints(c, sp, {}, 1);
    const plot::figure f = plan_figure(c, points, 1);
    ASSERT_EQ(f.panels.size(), 4u);  // z(V), I(s), phi_ap(s), I(V)
    const auto& trace = std::get<plot::xy_panel>(f.panels[0]);
    EXPECT_EQ(trace.title, "Constant-current trace z(V)");
    EXPECT_EQ(trace.x_axis.label, "sample bias V [V]");
    EXPECT_EQ(trace.y_axis.label, "planned gap s [nm]");
    // The trace's y values are the planned gaps in nm.
    ASSERT_EQ(trace.lines.at(0).y.size(), 3u);
    for (std::size_t i = 0; i < 3; ++i) EXPECT_DOUBLE_EQ(trace.lines[0].y[i], points[i].solution.gap_m * 1e9);
    const auto& ig = std::get<plot::xy_panel>(f.panels[1]);
    EXPECT_EQ(ig.y_axis.scale, plot::axis_scale::log10);
    EXPECT_EQ(ig.y_axis.label, "|current| [A]");

    const fs::path png = temp_file("plan.png");
    plot::write_figure(f, png.string());
    const std::string bytes = read_all(png.string());
    EXPECT_GT(bytes.size(), 10000u);  // a 1600 x 1168 page with four panels is far above 10 kB
    EXPECT_EQ(bytes.substr(0, 8), png_signature);
    fs::remove(png);
}

TEST(figures, predict_grid_colour_map_and_svg) {
    const config c = default_config();
    const std::vector<double> gaps{0.5e-9, 0.7e-9, 0.9e-9}, biases{-0.5, 0.2, 1.0};
    std::vector<std::pair<double, double>> pts;
    for (double V : biases)
        for (double s : gaps) pts.emplace_back(s, V);
    const auto r = predict_points(c, pts, 1);
    const plot::figure f = predict_figure(c, gaps, biases, r, 1);
    const auto& m = std::get<plot::colour_map_panel>(f.panels.at(0));
    ASSERT_EQ(m.z.size(), 9u);
    // In the data's unit since issue 15: the largest current here is a few hundred nA.
    for (std::size_t i = 0; i < 9; ++i) EXPECT_DOUBLE_EQ(m.z[i], std::log10(std::abs(r[i].current_A) * 1e9));
    EXPECT_EQ(m.colour_bar_label, "log₁₀(|I| / 1 nA)");
    EXPECT_DOUBLE_EQ(m.x[1], 0.7);

    const fs::path svg = temp_file("grid.svg");
    plot::write_figure(f, svg.string());
    EXPECT_GT(fs::file_size(svg), 10000u);
    // The SVG must parse as XML (Debian's Python and its standard parser).
    const std::string cmd = std::string(TIPGAP_PYTHON) +
                            " -c 'import sys, xml.dom.minidom as m; "
                            "assert m.parse(sys.argv[1]).documentElement.tagName == \"svg\"' '" +
                            svg.string() + "'";
    EXPECT_EQ(std::system(cmd.c_str()), 0);
    fs::remove(svg);
}

TEST(figures, no_reachable_point_is_no_answer) {
    plan_point p;
    p.solution.status = solve_status::current_too_high;
    try {
        plan_figure(default_config(), {p});
        FAIL();
    } catch (const error& e) {
        EXPECT_EQ(e.kind(), error_kind::no_answer);
    }
}
