#include "tipgap/grid/map_files.hpp"

#include <cmath>
#include <filesystem>
#include <fmt/format.h>

#include "tipgap/core/constants.hpp"

namespace tipgap {

namespace {

// metres -> nm as the map files have always written it.
constexpr scaling to_nm = divided_by(1e-9);

std::string coordinates(const std::vector<double>& v) {
    std::string s;
    // 12 significant digits: positions converted to metres and back pick up a last-digit error.
    for (std::size_t i = 0; i < v.size(); ++i) s += fmt::format("{}{:.12g}", i ? "," : "", to_nm(v[i]));
    return s;
}

std::string quality_codes() {
    std::string codes;
    for (std::size_t q = 0; q < pixel_quality_count; ++q)
        codes += fmt::format("{}{} {}", q ? ", " : "", q, to_string(static_cast<pixel_quality>(q)));
    return codes;
}

}  // namespace

const std::vector<std::string>& map_file_names() {
    static const std::vector<std::string> names = {"apparent_barrier_eV.csv", "decay_constant_per_nm.csv",
                                                   "stderr_apparent_barrier_eV.csv", "quality.csv", "summary.json",
                                                   "barrier_map.png", "barrier_histogram.png",
                                                   "stderr_map.png", "quality_map.png"};
    return names;
}

std::string map_matrix_csv(const barrier_map& m, const std::string& what, const std::vector<double>& values,
                           const scaling& scale) {
    fmt::memory_buffer out;
    fmt::format_to(std::back_inserter(out),
                   "# {}; one row per y (ascending), one column per x (ascending); NaN: no value\n# x [nm]: {}\n# y "
                   "[nm]: {}\n",
                   what, coordinates(m.grid.x_m), coordinates(m.grid.y_m));
    for (std::size_t iy = 0; iy < m.ny; ++iy) {
        for (std::size_t ix = 0; ix < m.nx; ++ix) {
            if (ix) out.push_back(',');
            // Shortest text that reads back to the same double; "NaN" (numpy.loadtxt and most
            // spreadsheet programs read it).
            const double v = scale(values[iy * m.nx + ix]);
            if (std::isnan(v)) fmt::format_to(std::back_inserter(out), "NaN");
            else fmt::format_to(std::back_inserter(out), "{}", v);
        }
        out.push_back('\n');
    }
    return fmt::to_string(out);
}

std::string map_quality_csv(const barrier_map& m) {
    fmt::memory_buffer out;
    fmt::format_to(std::back_inserter(out),
                   "# quality code per pixel: {}; one row per y (ascending), one column per x (ascending)\n# x [nm]: "
                   "{}\n# y [nm]: {}\n",
                   quality_codes(), coordinates(m.grid.x_m), coordinates(m.grid.y_m));
    for (std::size_t iy = 0; iy < m.ny; ++iy) {
        for (std::size_t ix = 0; ix < m.nx; ++ix) {
            if (ix) out.push_back(',');
            out.push_back(static_cast<char>('0' + static_cast<int>(m.quality[iy * m.nx + ix])));
        }
        out.push_back('\n');
    }
    return fmt::to_string(out);
}

std::vector<column<map_statistics>> map_statistics_columns(const scaling& scale) {
    using s = map_statistics;
    std::vector<column<s>> out = {
        {"count", "", [](const s& x) { return x.count; }},
        {"mean", "", [](const s& x) { return x.mean; }, scale},
        {"median", "", [](const s& x) { return x.median; }, scale},
        {"standard_deviation", "", [](const s& x) { return x.standard_deviation; }, scale},
        {"robust_spread", "", [](const s& x) { return x.robust_spread; }, scale},
        {"min", "", [](const s& x) { return x.min; }, scale},
        {"max", "", [](const s& x) { return x.max; }, scale},
        {"percentiles", "",
         [scale](const s& x) {
             record p;
             for (std::size_t k = 0; k < x.percentiles.size(); ++k)
                 p.set(fmt::format("p{:02.0f}", map_statistics::percentile_levels[k]), scale(x.percentiles[k]));
             return cell(p);
         }},
    };
    return out;
}

namespace {

const std::vector<column<barrier_map>>& grid_columns() {
    using b = barrier_map;
    static const std::vector<column<b>> columns = {
        {"path", "", [](const b& m) { return m.grid.path; }},
        {"layout", "", [](const b& m) { return m.grid.directory ? "directory" : m.grid.arrays ? "arrays" : "csv"; }},
        {"nx", "", [](const b& m) { return m.nx; }},
        {"ny", "", [](const b& m) { return m.ny; }},
        {"pixels", "", [](const b& m) { return m.grid.pixels; }},
        {"missing_pixels", "", [](const b& m) { return m.grid.missing; }},
        {"samples", "", [](const b& m) { return m.grid.samples; }},
        {"bytes", "", [](const b& m) { return m.grid.bytes; }},
        {"x_min_nm", "", [](const b& m) { return m.grid.x_m.front(); }, to_nm},
        {"x_max_nm", "", [](const b& m) { return m.grid.x_m.back(); }, to_nm},
        {"y_min_nm", "", [](const b& m) { return m.grid.y_m.front(); }, to_nm},
        {"y_max_nm", "", [](const b& m) { return m.grid.y_m.back(); }, to_nm},
        {"pitch_x_nm", "", [](const b& m) { return m.pitch_x_m; }, to_nm},
        {"pitch_y_nm", "", [](const b& m) { return m.pitch_y_m; }, to_nm},
        {"uniform_pitch", "", [](const b& m) { return m.uniform_pitch; }},
    };
    return columns;
}

const std::vector<column<map_options>>& map_fit_columns() {
    using o = map_options;
    static const std::vector<column<o>> columns = {
        {"model", "", [](const o& x) { return to_string(x.fit.model); }},
        {"noise_floor_A", "", [](const o& x) { return x.fit.noise_floor_A; }},
        {"saturation_A", "", [](const o& x) { return x.fit.saturation_A; }},
        {"current_noise_A", "", [](const o& x) { return x.fit.current_noise_A; }},
        {"calibration_uncertainty", "", [](const o& x) { return x.fit.calibration_uncertainty; }},
        {"confidence_level", "", [](const o& x) { return x.fit.confidence_level; }},
        {"contact_distance_nm", "", [](const o& x) { return x.fit.contact_distance_m; }, to_nm},
        {"min_current_decades", "", [](const o& x) { return x.min_current_decades; }},
        {"max_relative_stderr", "", [](const o& x) { return x.max_relative_stderr; }},
    };
    return columns;
}

record timings(const barrier_map& m, const map_run& run) {
    record t;
    t.set("read_and_fit_s", m.read_and_fit_seconds);
    t.set("outputs_s", run.output_seconds);
    t.set("total_s", run.total_seconds);
    t.set("read_and_fit_MB_per_s", static_cast<double>(m.grid.bytes) / 1e6 / m.read_and_fit_seconds);
    t.set("read_and_fit_samples_per_s", static_cast<double>(m.grid.samples) / m.read_and_fit_seconds);
    return t;
}

}  // namespace

record map_summary(const barrier_map& m, const map_options& o, const map_run& run) {
    const scaling to_eV = times(1.0 / si::electron_volt);
    record j;
    j.set("generator", run.generator);
    j.set("version", run.version);
    j.set("grid", to_record(grid_columns(), m));
    record meta;
    for (const auto& [k, v] : m.grid.metadata.entries) meta.set(k, v);
    j.set("metadata", meta);
    j.set("fit", to_record(map_fit_columns(), o));
    record reader;  // how the grid was read: the reader options that differ from the defaults
    for (const auto& [k, v] : settings(o.read.reader)) reader.set(k, v.empty() ? std::string("true") : v);
    j.set("reader", reader);
    j.set("apparent_barrier_eV", to_record(map_statistics_columns(to_eV), m.barrier));
    j.set("decay_constant_per_nm", to_record(map_statistics_columns(times(1e-9)), summarize(m.decay_constant_per_m)));
    j.set("stderr_apparent_barrier_eV", to_record(map_statistics_columns(to_eV), summarize(m.apparent_barrier_stderr_J)));
    record codes, counts;
    for (std::size_t q = 0; q < pixel_quality_count; ++q) {
        codes.set(std::to_string(q), to_string(static_cast<pixel_quality>(q)));
        counts.set(to_string(static_cast<pixel_quality>(q)), m.quality_counts[q]);
    }
    j.set("quality_codes", codes);
    j.set("quality_counts", counts);
    j.set("warnings", m.grid.warnings);
    j.set("notes", m.grid.notes);
    // Run-dependent entries last, so that outputs of two runs differ only here.
    j.set("threads", run.threads);
    j.set("timings", timings(m, run));
    return j;
}

std::string default_map_directory(const std::string& grid) {
    std::filesystem::path p(grid);
    while (p.has_parent_path() && p.filename().empty()) p = p.parent_path();  // "dir/"
    p.replace_extension();
    return p.string() + "_map";
}

std::string map_summary_text(const barrier_map& m, const std::string& out_dir) {
    const double to_eV = 1.0 / si::electron_volt;
    std::string counts;
    for (std::size_t q = 0; q < pixel_quality_count; ++q)
        counts += fmt::format("{}{} {}", q ? ", " : "", to_string(static_cast<pixel_quality>(q)), m.quality_counts[q]);
    std::string s = fmt::format("tipgap map: {} x {} pixels, {} samples -> {}\n", m.nx, m.ny, m.grid.samples, out_dir);
    if (m.barrier.count > 0) {
        s += fmt::format("  apparent barrier: {} eV (median ± MAD-based σ), {} eV (mean ± standard deviation), {} pixels with a value\n",
                         with_uncertainty(m.barrier.median * to_eV, m.barrier.robust_spread * to_eV),
                         with_uncertainty(m.barrier.mean * to_eV, m.barrier.standard_deviation * to_eV), m.barrier.count);
    } else {
        s += "  apparent barrier: no pixel has a value\n";
    }
    s += fmt::format("  quality: {}\n", counts);
    if (m.grid.missing > 0)
        s += fmt::format("  partial grid: {} of {} pixels missing (quality 'missing', NaN in the maps)\n", m.grid.missing, m.nx * m.ny);
    return s;
}

}  // namespace tipgap
