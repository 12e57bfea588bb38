// Building the two-panel figure of a resonance analysis (see resonance_plot.hpp).
#include "tipgap/figures/resonance_plot.hpp"

#include <fmt/format.h>

#include "tipgap/core/constants.hpp"
#include "tipgap/io/columns.hpp"

namespace tipgap {

plot::figure make_resonance_figure(const bias_trace& t, const resonance_result& r, const std::string& title) {
    const bool zv = t.kind == trace_kind::zv;
    // Display units: nm for z, nm/V for dz/dV; nS for a conductance, as given for arbitrary units.
    const double scale = zv ? 1e9 : (t.arbitrary_units ? 1.0 : 1e9);
    const std::string unit = zv ? "nm" : (t.arbitrary_units ? "a.u." : "nS");
    auto scaled = [&](const std::vector<double>& v) {
        std::vector<double> out(v.size());
        for (std::size_t i = 0; i < v.size(); ++i) out[i] = v[i] * scale;
        return out;
    };

    plot::xy_panel trace_panel;
    trace_panel.title = zv ? "constant-current trace z(V)" : "dI/dV(V), feedback on";
    trace_panel.x_axis.label = "sample bias [V]";
    trace_panel.y_axis.label = zv ? "z [nm]" : fmt::format("dI/dV [{}]", unit);
    trace_panel.lines.push_back({t.bias_V, scaled(t.signal), "measured", plot::draw_style::markers, 0});
    if (!r.model_signal.empty()) {
        trace_panel.lines.push_back({t.bias_V, scaled(r.model_signal),
                                     fmt::format("exact model, φ = {:.3f} eV", r.work_function_J / si::electron_volt),
                                     plot::draw_style::line, 1});
    }
    trace_panel.legend = plot::legend_position::top_left;

    plot::xy_panel peak_panel;
    peak_panel.title = fmt::format("{} smoothed over {:g} V, peaks marked", zv ? "dz/dV" : "dI/dV", r.smoothing_width_V);
    peak_panel.x_axis.label = "sample bias [V]";
    peak_panel.y_axis.label = zv ? "dz/dV [nm/V]" : fmt::format("dI/dV [{}]", unit);
    peak_panel.lines.push_back({r.bias_V, scaled(r.smoothed), "measured", plot::draw_style::line, 0});
    if (!r.model_smoothed.empty()) peak_panel.lines.push_back({r.bias_V, scaled(r.model_smoothed), "model", plot::draw_style::line, 1});
    for (const resonance_peak& p : r.peaks) {
        peak_panel.references.push_back(
            {plot::orientation::vertical, p.bias_V, fmt::format("n = {}: {} V", p.order, with_uncertainty(p.bias_V, p.bias_stderr_V))});
    }
    peak_panel.legend = plot::legend_position::top_left;

    plot::figure fig;
    fig.title = title;
    fig.panels = {trace_panel, peak_panel};
    return fig;
}

}  // namespace tipgap
