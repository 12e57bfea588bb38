#include "tipgap/figures/map_figures.hpp"

#include <cmath>
#include <fmt/format.h>

#include "tipgap/core/constants.hpp"

namespace tipgap {

namespace {
constexpr double to_eV = 1.0 / si::electron_volt;
double nm(double m) { return m / 1e-9; }
}  // namespace

plot::figure barrier_map_figure(const barrier_map& m) {
    plot::colour_map_panel map;
    map.title = fmt::format("apparent barrier height, {} x {} pixels", m.nx, m.ny);
    map.x_axis.label = "x [nm]";
    map.y_axis.label = "y [nm]";
    for (double v : m.grid.x_m) map.x.push_back(nm(v));
    for (double v : m.grid.y_m) map.y.push_back(nm(v));
    for (double v : m.apparent_barrier_J) map.z.push_back(v * to_eV);
    map.colour_bar_label = "apparent barrier [eV]";
    map.equal_aspect = true;
    // Colour range from the 1st to the 99th percentile (they are drawn in the end colours).
    const double lo = m.barrier.percentiles[0] * to_eV, hi = m.barrier.percentiles[5] * to_eV;
    if (m.barrier.count == 0) {
        map.z_min = 0.0;
        map.z_max = 1.0;
    } else if (hi > lo) {
        map.z_min = lo;
        map.z_max = hi;
    }
    plot::figure f;
    f.panels.push_back(map);
    f.panel_width = 760;
    f.panel_height = 680;
    return f;
}

plot::figure barrier_histogram_figure(const barrier_map& m) {
    std::vector<double> values;
    for (double v : m.apparent_barrier_J)
        if (std::isfinite(v * to_eV)) values.push_back(v * to_eV);
    plot::histogram_panel h;
    h.title = fmt::format("apparent barrier height of {} pixels", values.size());
    h.x_axis.label = "apparent barrier [eV]";
    h.y_label = "pixels";
    h.values = values.empty() ? std::vector<double>{0.0} : values;
    if (!values.empty()) {
        h.markers.push_back({plot::orientation::vertical, m.barrier.mean * to_eV,
                             fmt::format("mean {:.3f} eV", m.barrier.mean * to_eV)});
        h.markers.push_back({plot::orientation::vertical, m.barrier.median * to_eV,
                             fmt::format("median {:.3f} eV", m.barrier.median * to_eV)});
    } else {
        h.title = "no pixel has a value";
    }
    plot::figure f;
    f.panels.push_back(h);
    return f;
}

}  // namespace tipgap
