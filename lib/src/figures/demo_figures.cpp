#include "tipgap/figures/demo_figures.hpp"

#include <cmath>
#include <fmt/format.h>

#include "tipgap/core/constants.hpp"

namespace tipgap {

plot::figure demo_prediction_figure(const demo_report& r) {
    constexpr double eV = si::electron_volt;
    plot::xy_panel cur;
    cur.title = fmt::format("predicted current, built-in config, {:.3g} V", r.sweep.front().q.bias_V);
    cur.x_axis.label = "gap [nm]";
    cur.y_axis.label = "|I| [A]";
    cur.y_axis.scale = plot::axis_scale::log10;
    plot::series s{{}, {}, "|I|", plot::draw_style::line_and_markers, 0};
    plot::xy_panel phi;
    phi.title = "apparent barrier height from the model";
    phi.x_axis.label = "gap [nm]";
    phi.y_axis.label = "φ_ap [eV]";
    plot::series p{{}, {}, "φ_ap = (ħ²/8m)(d ln|J|/ds)²", plot::draw_style::line_and_markers, 1};
    for (const prediction& q : r.sweep) {
        s.x.push_back(q.q.gap_m * 1e9);
        s.y.push_back(std::abs(q.current_A));
        p.x.push_back(q.q.gap_m * 1e9);
        p.y.push_back(q.q.apparent_barrier_J / eV);
    }
    cur.lines.push_back(s);
    phi.lines.push_back(p);
    const double mean = 0.5 * (r.cfg.model.tip.work_function_J + r.cfg.model.sample.work_function_J) / eV;
    phi.references.push_back({plot::orientation::horizontal, mean, "mean work function"});
    phi.legend = plot::legend_position::bottom_right;
    plot::figure f;
    f.title = "tipgap demo: prediction";
    f.panels = {cur, phi};
    f.columns = 1;
    f.panel_height = 420;
    return f;
}

}  // namespace tipgap
