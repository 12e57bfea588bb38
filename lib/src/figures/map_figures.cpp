#include "tipgap/figures/map_figures.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <fmt/format.h>

#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap {

namespace {
constexpr double to_eV = 1.0 / si::electron_volt;
double nm(double m) { return m / 1e-9; }

// A colour map of one value per pixel (row-major like the map), scaled by `scale`.
plot::colour_map_panel pixel_map(const barrier_map& m, const std::vector<double>& values, double scale) {
    plot::colour_map_panel map;
    map.x_axis.label = "x [nm]";
    map.y_axis.label = "y [nm]";
    for (double v : m.grid.x_m) map.x.push_back(nm(v));
    for (double v : m.grid.y_m) map.y.push_back(nm(v));
    for (double v : values) map.z.push_back(v * scale);
    map.equal_aspect = true;
    return map;
}

plot::figure one_map(const plot::colour_map_panel& map) {
    plot::figure f;
    f.panels.push_back(map);
    f.panel_width = 760;
    f.panel_height = 680;
    return f;
}
}  // namespace

void map_figure_options::validate() const {
    const location where{"", 0, 0, "range"};
    if (barrier_min_J.has_value() != barrier_max_J.has_value()) throw_input(where, "needs both ends, MIN..MAX");
    if (barrier_min_J && !(std::isfinite(*barrier_min_J) && std::isfinite(*barrier_max_J) && *barrier_min_J < *barrier_max_J))
        throw_input(where, fmt::format("MIN must be below MAX; got {:g}..{:g} eV", *barrier_min_J * to_eV, *barrier_max_J * to_eV));
}

plot::figure barrier_map_figure(const barrier_map& m, const map_figure_options& options) {
    options.validate();
    plot::colour_map_panel map = pixel_map(m, m.apparent_barrier_J, to_eV);
    map.title = fmt::format("apparent barrier height, {} x {} pixels", m.nx, m.ny);
    map.colour_bar_label = "apparent barrier [eV]";
    // Colour range from the 1st to the 99th percentile (they are drawn in the end colours).
    const double lo = m.barrier.percentiles[0] * to_eV, hi = m.barrier.percentiles[5] * to_eV;
    if (options.barrier_min_J) {
        map.z_min = *options.barrier_min_J * to_eV;
        map.z_max = *options.barrier_max_J * to_eV;
    } else if (m.barrier.count == 0) {
        map.z_min = 0.0;
        map.z_max = 1.0;
    } else if (hi > lo) {
        map.z_min = lo;
        map.z_max = hi;
    }
    return one_map(map);
}

plot::figure stderr_map_figure(const barrier_map& m) {
    // meV: standard errors are usually a few meV, and numbers like 0.003 read slowly.
    plot::colour_map_panel map = pixel_map(m, m.apparent_barrier_stderr_J, 1e3 * to_eV);
    map.title = "standard error of the apparent barrier height";
    map.colour_bar_label = "standard error [meV]";
    std::vector<double> finite;
    for (double v : map.z)
        if (std::isfinite(v)) finite.push_back(v);
    if (finite.size() >= 2) {
        std::sort(finite.begin(), finite.end());
        const double lo = finite[finite.size() / 100], hi = finite[finite.size() - 1 - finite.size() / 100];
        if (hi > lo) {
            map.z_min = lo;
            map.z_max = hi;
        }
    }
    return one_map(map);
}

plot::figure quality_map_figure(const barrier_map& m) {
    std::vector<double> codes;
    for (pixel_quality q : m.quality) codes.push_back(static_cast<double>(q));
    plot::colour_map_panel map = pixel_map(m, codes, 1.0);
    // The codes present, by name, when they fit the panel's width (~56 characters); else a pointer
    // to the code table.
    std::array<bool, pixel_quality_count> present{};
    for (pixel_quality q : m.quality) present[static_cast<std::size_t>(q)] = true;
    std::string key;
    for (std::size_t q = 0; q < pixel_quality_count; ++q)
        if (present[q])
            key += fmt::format("{}{} {}", key.empty() ? "" : ", ", q, to_string(static_cast<pixel_quality>(q)));
    map.title = key.size() <= 47 ? "quality: " + key : "quality code per pixel (0 ok; the README lists the codes)";
    map.colour_bar_label = "quality code";
    // Half a step beyond the codes: each code gets its own band of the (lightness-ordered) palette.
    map.z_min = -0.5;
    map.z_max = static_cast<double>(pixel_quality_count) - 0.5;
    return one_map(map);
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
