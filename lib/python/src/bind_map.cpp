// _map and _read_grid: barrier maps of a grid held in arrays (make_barrier_map over
// visit_grid_arrays, the code that maps a grid file), and the project's grid reader into arrays.
#include <algorithm>
#include <chrono>
#include <fmt/format.h>
#include <memory>
#include <string>
#include <vector>

#include "bindings.hpp"
#include "convert.hpp"
#include "fit_keywords.hpp"
#include "keywords.hpp"
#include "tipgap/grid/grid_arrays.hpp"
#include "tipgap/grid/map.hpp"
#include "tipgap/grid/map_files.hpp"
#include "tipgap/grid/map_matrices.hpp"

namespace tipgap::python {

namespace {

constexpr scaling to_nm = divided_by(1e-9);  // as the map summary converts positions

map_options map_options_from(const py::dict& k, int threads) {
    map_options o;
    o.fit = fit_options_from(k, "map");
    if (k.contains("min_decades") && !k["min_decades"].is_none()) o.min_current_decades = py::cast<double>(k["min_decades"]);
    if (k.contains("max_relative_error") && !k["max_relative_error"].is_none())
        o.max_relative_stderr = py::cast<double>(k["max_relative_error"]);
    o.read.threads = threads;
    naming_keywords("map", [&] { o.validate(); });
    return o;
}

template <class T, class F>
py::array_t<T> matrix(const barrier_map& m, F value) {
    py::array_t<T> a({static_cast<py::ssize_t>(m.ny), static_cast<py::ssize_t>(m.nx)});
    T* p = a.mutable_data();
    for (std::size_t k = 0; k < m.nx * m.ny; ++k) p[k] = value(k);
    return a;
}

py::dict map_dict(const barrier_map& m, const map_options& o, const map_run& run) {
    py::dict d;
    for (const map_matrix& x : map_matrices()) {
        const std::vector<double>& v = x.values(m);
        d[py::str(x.key)] = matrix<double>(m, [&](std::size_t k) { return x.scale(v[k]); });
    }
    d["quality"] = matrix<std::uint8_t>(m, [&](std::size_t k) { return static_cast<std::uint8_t>(m.quality[k]); });
    d["points_used"] = matrix<std::uint32_t>(m, [&](std::size_t k) { return m.points_used[k]; });
    d["x_nm"] = to_array(m.grid.x_m, to_nm);
    d["y_nm"] = to_array(m.grid.y_m, to_nm);
    d["summary"] = to_dict(map_summary(m, o, run));
    return d;
}

py::dict map(const double_array& z_nm, const double_array& current_A, std::size_t samples, const double_array& x_nm,
             const double_array& y_nm, double bias_V, const py::dict& options, int threads, const std::string& name) {
    if (threads < 0) throw_input(location{"", 0, 0, "threads"}, fmt::format("{} is not a thread count; expected 0 (all cores) or more", threads));
    const map_options o = map_options_from(options, threads);
    grid_arrays g;
    g.name = name;
    // nm -> m as the grid reader converts "x [nm]" and "z [nm]" columns (value * 1e-9).
    g.x_m = scaled_vector(x_nm, 1e-9);
    g.y_m = scaled_vector(y_nm, 1e-9);
    const std::vector<double> z = scaled_vector(z_nm, 1e-9), current = to_vector(current_A);
    g.samples = samples;
    g.z_m = z;
    g.current_A = current;
    g.bias_V = bias_V;
    barrier_map m;
    map_run run{"tipgap.map (Python)", TIPGAP_VERSION, resolved_threads(o.read), 0.0, 0.0};
    {
        py::gil_scoped_release unlocked;
        const auto t0 = std::chrono::steady_clock::now();
        m = naming_keywords("map", [&] {
            return make_barrier_map([&](const grid_visitor& visit) { return visit_grid_arrays(g, o.read, visit); }, o);
        });
        run.total_seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    }
    return map_dict(m, o, run);
}

// One pixel as read, until the layout says where it goes.
struct read_pixel {
    double x_m, y_m;
    std::vector<double> z_m, current_A;
};

py::array_t<double> cube(const std::vector<read_pixel>& placed, std::size_t ny, std::size_t nx, std::size_t nz, bool z) {
    py::array_t<double> a({static_cast<py::ssize_t>(ny), static_cast<py::ssize_t>(nx), static_cast<py::ssize_t>(nz)});
    double* p = a.mutable_data();
    for (std::size_t k = 0; k < placed.size(); ++k)
        for (std::size_t i = 0; i < nz; ++i) p[k * nz + i] = z ? to_nm(placed[k].z_m[i]) : placed[k].current_A[i];
    return a;
}

py::dict read_grid_arrays(const std::string& path, int threads, std::size_t chunk_bytes) {
    if (threads < 0) throw_input(location{"", 0, 0, "threads"}, fmt::format("{} is not a thread count; expected 0 (all cores) or more", threads));
    grid_read_options o;
    o.threads = threads;
    o.chunk_bytes = chunk_bytes;
    std::vector<std::vector<read_pixel>> slots(resolved_threads(o) + 1);
    std::vector<read_pixel> placed;
    grid_layout layout;
    {
        py::gil_scoped_release unlocked;
        layout = read_grid(path, o, [&](const grid_pixel_view& px, unsigned slot) {
            slots[slot].push_back({px.x_m, px.y_m, {px.z_m.begin(), px.z_m.end()}, {px.current_A.begin(), px.current_A.end()}});
        });
        placed.resize(layout.pixels);
        for (auto& s : slots)
            for (read_pixel& px : s) {
                const auto ix = static_cast<std::size_t>(std::lower_bound(layout.x_m.begin(), layout.x_m.end(), px.x_m) - layout.x_m.begin());
                const auto iy = static_cast<std::size_t>(std::lower_bound(layout.y_m.begin(), layout.y_m.end(), px.y_m) - layout.y_m.begin());
                placed[iy * layout.x_m.size() + ix] = std::move(px);
            }
        for (const read_pixel& px : placed)
            if (px.z_m.size() != placed.front().z_m.size())
                throw_input(location{path, 0, 0, ""},
                            fmt::format("pixel (x = {:g} nm, y = {:g} nm) has {} samples and the first pixel {}; arrays "
                                        "need the same number in every pixel",
                                        to_nm(px.x_m), to_nm(px.y_m), px.z_m.size(), placed.front().z_m.size()));
    }
    const std::size_t nz = placed.front().z_m.size();
    py::dict d;
    d["path"] = layout.path;
    d["layout"] = layout.directory ? "directory" : "csv";
    py::dict meta;
    for (const auto& [k, v] : layout.metadata.entries) meta[py::str(k)] = v;
    d["metadata"] = meta;
    d["bias_V"] = layout.metadata.bias_V ? py::object(py::float_(*layout.metadata.bias_V)) : py::none();
    d["x_nm"] = to_array(layout.x_m, to_nm);
    d["y_nm"] = to_array(layout.y_m, to_nm);
    d["z_nm"] = cube(placed, layout.y_m.size(), layout.x_m.size(), nz, true);
    d["current_A"] = cube(placed, layout.y_m.size(), layout.x_m.size(), nz, false);
    py::list warnings;
    for (const auto& w : layout.warnings) warnings.append(w);
    d["warnings"] = warnings;
    return d;
}

}  // namespace

void bind_map(py::module_& m) {
    m.def("_map", &map, py::arg("z_nm"), py::arg("current_A"), py::arg("samples"), py::arg("x_nm"), py::arg("y_nm"),
          py::arg("bias_V"), py::arg("options"), py::arg("threads"), py::arg("name"));
    m.def("_read_grid", &read_grid_arrays, py::arg("path"), py::arg("threads"), py::arg("chunk_bytes"));
}

}  // namespace tipgap::python
