// tipgap map: barrier-height maps of a spectroscopy grid. Parses flags, calls
// tipgap::make_barrier_map, and writes the matrices, the summary and the figures into an output
// directory that appears whole or not at all.
#include <chrono>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fmt/format.h>
#include <memory>
#include <nlohmann/json.hpp>
#include <string>
#include <unistd.h>
#include <vector>

#include "commands.hpp"
#include "fit_flags.hpp"
#include "output.hpp"
#include "tipgap/io/atomic_directory.hpp"
#include "tipgap/io/atomic_file.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/grid/map.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap::cli {
namespace {

const std::vector<std::string> output_files = {"apparent_barrier_eV.csv", "decay_constant_per_nm.csv",
                                                "stderr_apparent_barrier_eV.csv", "quality.csv", "summary.json",
                                                "barrier_map.png", "barrier_histogram.png"};

struct map_args {
    std::string grid;
    std::string output_dir;
    int threads = 0;
    bool quiet = false;
    fit_flags flags;
    double min_decades = 1.0;
    double max_relative_error = 0.1;
};

double nm(double m) { return m / 1e-9; }

// Shortest text that reads back to the same double; "NaN" for no value (numpy.loadtxt and most
// spreadsheet programs read it).
void append_value(fmt::memory_buffer& out, double v) {
    if (std::isnan(v)) {
        fmt::format_to(std::back_inserter(out), "NaN");
    } else {
        fmt::format_to(std::back_inserter(out), "{}", v);
    }
}

std::string coordinates(const std::vector<double>& v) {
    std::string s;
    // 12 significant digits: positions converted to metres and back pick up a last-digit error.
    for (std::size_t i = 0; i < v.size(); ++i) s += fmt::format("{}{:.12g}", i ? "," : "", nm(v[i]));
    return s;
}

// A matrix file: '#' lines saying what it holds and where, then one row per y.
std::string matrix_csv(const barrier_map& m, const std::string& what, const std::vector<double>& values, double scale) {
    fmt::memory_buffer out;
    fmt::format_to(std::back_inserter(out),
                   "# {}; one row per y (ascending), one column per x (ascending); NaN: no value\n# x [nm]: {}\n# y "
                   "[nm]: {}\n",
                   what, coordinates(m.grid.x_m), coordinates(m.grid.y_m));
    for (std::size_t iy = 0; iy < m.ny; ++iy) {
        for (std::size_t ix = 0; ix < m.nx; ++ix) {
            if (ix) out.push_back(',');
            append_value(out, values[iy * m.nx + ix] * scale);
        }
        out.push_back('\n');
    }
    return fmt::to_string(out);
}

std::string quality_csv(const barrier_map& m) {
    fmt::memory_buffer out;
    std::string codes;
    for (std::size_t q = 0; q < pixel_quality_count; ++q)
        codes += fmt::format("{}{} {}", q ? ", " : "", q, to_string(static_cast<pixel_quality>(q)));
    fmt::format_to(std::back_inserter(out),
                   "# quality code per pixel: {}; one row per y (ascending), one column per x (ascending)\n# x [nm]: "
                   "{}\n# y [nm]: {}\n",
                   codes, coordinates(m.grid.x_m), coordinates(m.grid.y_m));
    for (std::size_t iy = 0; iy < m.ny; ++iy) {
        for (std::size_t ix = 0; ix < m.nx; ++ix) {
            if (ix) out.push_back(',');
            out.push_back(static_cast<char>('0' + static_cast<int>(m.quality[iy * m.nx + ix])));
        }
        out.push_back('\n');
    }
    return fmt::to_string(out);
}

nlohmann::ordered_json stats_json(const map_statistics& s, double scale) {
    nlohmann::ordered_json j;
    j["count"] = s.count;
    j["mean"] = s.mean * scale;
    j["median"] = s.median * scale;
    j["standard_deviation"] = s.standard_deviation * scale;
    j["robust_spread"] = s.robust_spread * scale;
    j["min"] = s.min * scale;
    j["max"] = s.max * scale;
    nlohmann::ordered_json p;
    for (std::size_t k = 0; k < s.percentiles.size(); ++k)
        p[fmt::format("p{:02.0f}", map_statistics::percentile_levels[k])] = s.percentiles[k] * scale;
    j["percentiles"] = p;
    return j;
}

std::string summary_json(const map_args& a, const map_options& o, const barrier_map& m, unsigned threads,
                         double output_seconds, double total_seconds) {
    nlohmann::ordered_json j;
    j["generator"] = "tipgap map";
    j["version"] = TIPGAP_VERSION;
    nlohmann::ordered_json g;
    g["path"] = m.grid.path;
    g["layout"] = m.grid.directory ? "directory" : "csv";
    g["nx"] = m.nx;
    g["ny"] = m.ny;
    g["pixels"] = m.grid.pixels;
    g["samples"] = m.grid.samples;
    g["bytes"] = m.grid.bytes;
    g["x_min_nm"] = nm(m.grid.x_m.front());
    g["x_max_nm"] = nm(m.grid.x_m.back());
    g["y_min_nm"] = nm(m.grid.y_m.front());
    g["y_max_nm"] = nm(m.grid.y_m.back());
    g["pitch_x_nm"] = nm(m.pitch_x_m);
    g["pitch_y_nm"] = nm(m.pitch_y_m);
    g["uniform_pitch"] = m.uniform_pitch;
    j["grid"] = g;
    nlohmann::ordered_json meta = nlohmann::ordered_json::object();
    for (const auto& [k, v] : m.grid.metadata.entries) meta[k] = v;
    j["metadata"] = meta;
    nlohmann::ordered_json f;
    f["model"] = to_string(o.fit.model);
    f["noise_floor_A"] = o.fit.noise_floor_A;
    f["saturation_A"] = o.fit.saturation_A;
    f["current_noise_A"] = o.fit.current_noise_A;
    f["calibration_uncertainty"] = o.fit.calibration_uncertainty;
    f["confidence_level"] = o.fit.confidence_level;
    f["contact_distance_nm"] = nm(o.fit.contact_distance_m);
    f["min_current_decades"] = o.min_current_decades;
    f["max_relative_stderr"] = o.max_relative_stderr;
    j["fit"] = f;
    j["apparent_barrier_eV"] = stats_json(m.barrier, 1.0 / si::electron_volt);
    j["decay_constant_per_nm"] = stats_json(summarize(m.decay_constant_per_m), 1e-9);
    j["stderr_apparent_barrier_eV"] = stats_json(summarize(m.apparent_barrier_stderr_J), 1.0 / si::electron_volt);
    nlohmann::ordered_json codes, counts;
    for (std::size_t q = 0; q < pixel_quality_count; ++q) {
        codes[std::to_string(q)] = to_string(static_cast<pixel_quality>(q));
        counts[to_string(static_cast<pixel_quality>(q))] = m.quality_counts[q];
    }
    j["quality_codes"] = codes;
    j["quality_counts"] = counts;
    j["warnings"] = m.grid.warnings;
    // Run-dependent entries last, so that outputs of two runs differ only here.
    j["threads"] = threads;
    nlohmann::ordered_json t;
    t["read_and_fit_s"] = m.read_and_fit_seconds;
    t["outputs_s"] = output_seconds;
    t["total_s"] = total_seconds;
    t["read_and_fit_MB_per_s"] = static_cast<double>(m.grid.bytes) / 1e6 / m.read_and_fit_seconds;
    t["read_and_fit_samples_per_s"] = static_cast<double>(m.grid.samples) / m.read_and_fit_seconds;
    j["timings"] = t;
    (void)a;
    return j.dump(2) + "\n";
}

void write_figures(const barrier_map& m, const atomic_directory& dir) {
    const double to_ev = 1.0 / si::electron_volt;
    std::vector<double> x, y, z(m.apparent_barrier_J.size()), values;
    for (double v : m.grid.x_m) x.push_back(nm(v));
    for (double v : m.grid.y_m) y.push_back(nm(v));
    for (std::size_t k = 0; k < z.size(); ++k) {
        z[k] = m.apparent_barrier_J[k] * to_ev;
        if (std::isfinite(z[k])) values.push_back(z[k]);
    }
    plot::colour_map_panel map;
    map.title = fmt::format("apparent barrier height, {} x {} pixels", m.nx, m.ny);
    map.x_axis.label = "x [nm]";
    map.y_axis.label = "y [nm]";
    map.x = x;
    map.y = y;
    map.z = z;
    map.colour_bar_label = "apparent barrier [eV]";
    map.equal_aspect = true;
    // Colour range from the 1st to the 99th percentile, so that a few wild pixels do not wash out
    // the map (they are drawn in the end colours).
    const double lo = m.barrier.percentiles[0] * to_ev, hi = m.barrier.percentiles[5] * to_ev;
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
    plot::write_figure(f, dir.file("barrier_map.png"));

    plot::histogram_panel h;
    h.title = fmt::format("apparent barrier height of {} pixels", values.size());
    h.x_axis.label = "apparent barrier [eV]";
    h.y_label = "pixels";
    h.values = values.empty() ? std::vector<double>{0.0} : values;
    if (!values.empty()) {
        h.markers.push_back({plot::orientation::vertical, m.barrier.mean * to_ev,
                             fmt::format("mean {:.3f} eV", m.barrier.mean * to_ev)});
        h.markers.push_back({plot::orientation::vertical, m.barrier.median * to_ev,
                             fmt::format("median {:.3f} eV", m.barrier.median * to_ev)});
    } else {
        h.title = "no pixel has a value";
    }
    plot::figure fh;
    fh.panels.push_back(h);
    plot::write_figure(fh, dir.file("barrier_histogram.png"));
}

// A one-line bar redrawn in place; only for a terminal.
class progress_bar {
public:
    void operator()(std::uint64_t done, std::uint64_t total) {
        const double frac = total > 0 ? static_cast<double>(done) / static_cast<double>(total) : 1.0;
        const int width = 40;
        const int filled = static_cast<int>(frac * width);
        fmt::print(stderr, "\rtipgap map: [{:#<{}}{:<{}}] {:3.0f}%  {:.0f}/{:.0f} MB", "", filled, "", width - filled,
                   100.0 * frac, static_cast<double>(done) / 1e6, static_cast<double>(total) / 1e6);
        std::fflush(stderr);
        shown_ = true;
    }
    void finish() {
        if (shown_) fmt::print(stderr, "\n");
    }

private:
    bool shown_ = false;
};

std::string default_output_dir(const std::string& grid) {
    std::filesystem::path p(grid);
    while (p.has_parent_path() && p.filename().empty()) p = p.parent_path();  // "dir/"
    p.replace_extension();
    return p.string() + "_map";
}

void run_map(const map_args& a) {
    const auto t0 = std::chrono::steady_clock::now();
    map_options o;
    o.fit = to_fit_options(a.flags);
    o.min_current_decades = a.min_decades;
    o.max_relative_stderr = a.max_relative_error;
    if (a.threads < 0) throw_usage("--threads", "must be >= 0 (0 = all cores)");
    if (!(a.min_decades > 0.0)) throw_usage("--min-decades", "must be > 0");
    if (!(a.max_relative_error > 0.0)) throw_usage("--max-relative-error", "must be > 0");
    o.read.threads = a.threads;
    const bool show_progress = !a.quiet && ::isatty(STDERR_FILENO);
    auto bar = std::make_shared<progress_bar>();
    if (show_progress) o.read.progress = [bar](std::uint64_t d, std::uint64_t t) { (*bar)(d, t); };

    const std::string out_dir = a.output_dir.empty() ? default_output_dir(a.grid) : a.output_dir;
    // Created (and checked) before the work, so that an unusable target fails at once.
    atomic_directory dir(out_dir, output_files);
    barrier_map m;
    try {
        m = make_barrier_map(a.grid, o);
    } catch (...) {
        bar->finish();
        throw;
    }
    bar->finish();
    print_warnings(m.grid.warnings, m.grid.path);

    const auto t1 = std::chrono::steady_clock::now();
    const double to_ev = 1.0 / si::electron_volt;
    write_file_atomically(dir.file("apparent_barrier_eV.csv"),
                          matrix_csv(m, "apparent barrier height [eV]", m.apparent_barrier_J, to_ev));
    write_file_atomically(dir.file("decay_constant_per_nm.csv"),
                          matrix_csv(m, "decay constant [1/nm]", m.decay_constant_per_m, 1e-9));
    write_file_atomically(dir.file("stderr_apparent_barrier_eV.csv"),
                          matrix_csv(m, "standard error of the apparent barrier height [eV]", m.apparent_barrier_stderr_J, to_ev));
    write_file_atomically(dir.file("quality.csv"), quality_csv(m));
    write_figures(m, dir);
    const auto t2 = std::chrono::steady_clock::now();
    const double output_s = std::chrono::duration<double>(t2 - t1).count();
    const double total_s = std::chrono::duration<double>(t2 - t0).count();
    write_file_atomically(dir.file("summary.json"),
                          summary_json(a, o, m, resolved_threads(o.read), output_s, total_s));
    dir.commit();

    if (!a.quiet) {
        std::string counts;
        for (std::size_t q = 0; q < pixel_quality_count; ++q)
            counts += fmt::format("{}{} {}", q ? ", " : "", to_string(static_cast<pixel_quality>(q)), m.quality_counts[q]);
        fmt::print("tipgap map: {} x {} pixels, {} samples -> {}\n", m.nx, m.ny, m.grid.samples, out_dir);
        if (m.barrier.count > 0) {
            fmt::print("  apparent barrier: median {:.3f} eV, mean {:.3f} eV, spread {:.3f} eV ({} pixels with a value)\n",
                       m.barrier.median * to_ev, m.barrier.mean * to_ev, m.barrier.robust_spread * to_ev, m.barrier.count);
        } else {
            fmt::print("  apparent barrier: no pixel has a value\n");
        }
        fmt::print("  quality: {}\n", counts);
    }
}

}  // namespace

void add_map(CLI::App& app) {
    auto args = std::make_shared<map_args>();
    CLI::App* cmd = app.add_subcommand(
        "map", "Barrier-height maps of a spectroscopy grid (one long CSV, or a directory of curve files with x/y metadata)");
    cmd->add_option("grid", args->grid,
                    "Grid CSV ('x [nm],y [nm],z [nm],current [pA]', one row per sample, each pixel's rows together) or "
                    "a directory of curve files")
        ->required()
        ->type_name("GRID");
    cmd->add_option("--output-dir", args->output_dir,
                    "Directory to write (replaced whole when it holds an earlier map; default: GRID without its "
                    "extension + '_map')")
        ->type_name("DIR");
    cmd->add_option("--threads", args->threads, "Worker threads (default 0 = all cores); results do not depend on it")
        ->type_name("N");
    cmd->add_flag("--quiet", args->quiet, "No progress bar and no summary on stdout");
    add_fit_flags(cmd, args->flags, false);
    cmd->add_option("--min-decades", args->min_decades,
                    "Quality 'poor_fit' when the used points span fewer decades of current (default 1)")
        ->type_name("DECADES");
    cmd->add_option("--max-relative-error", args->max_relative_error,
                    "Quality 'poor_fit' when the standard error of the barrier exceeds this fraction of it (default 0.1)")
        ->type_name("FRACTION");
    cmd->callback([args]() { run_map(*args); });
}

}  // namespace tipgap::cli
