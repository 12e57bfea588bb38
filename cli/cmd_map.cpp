// tipgap map: barrier-height maps of a spectroscopy grid. Parses flags, calls
// tipgap::make_barrier_map, and writes the matrices, the summary and the figures into an output
// directory that appears whole or not at all.
#include <chrono>
#include <fmt/format.h>
#include <memory>
#include <string>

#include "command.hpp"
#include "flags.hpp"
#include "output.hpp"
#include "shared_flags.hpp"
#include "tipgap/core/progress.hpp"
#include "tipgap/figures/map_directory.hpp"
#include "tipgap/grid/map_checks.hpp"

namespace tipgap::cli {
namespace {

struct map_args {
    std::string grid;
    std::string output_dir;
    int threads = 0;
    bool quiet = false;
    bool no_figures = false;
    bool partial = false;
    fit_flags flags;
    read_flags read;
    double min_decades = 1.0;
    double max_relative_error = 0.1;
    std::string range;  // --range MIN..MAX: colour scale of the barrier map
};

// --range MIN..MAX as energies (eV, meV, J); the library checks MIN < MAX.
map_figure_options to_map_figure_options(const std::string& range) {
    map_figure_options o;
    if (range.empty()) return o;
    if (range.find("..") == std::string::npos) throw_usage("--range", "expected MIN..MAX, e.g. 4.0eV..4.8eV");
    const std::vector<double> ends = parse_range(range, dimension::energy, 2, spacing::linear, "--range");
    o.barrier_min_J = ends.front();
    o.barrier_max_J = ends.back();
    naming_flags("map", flag_error::usage, [&] { o.validate(); });
    return o;
}

void run(const map_args& a) {
    const auto t0 = std::chrono::steady_clock::now();
    map_options o;
    o.fit = to_fit_options(a.flags, "map");
    o.min_current_decades = a.min_decades;
    o.max_relative_stderr = a.max_relative_error;
    o.read.threads = a.threads;
    o.read.partial = a.partial;
    o.read.reader = to_reader_options(a.read, "map", 4);
    naming_flags("map", flag_error::usage, [&] { o.validate(); });
    const map_figure_options figure = to_map_figure_options(a.range);
    o.read.progress = report_progress;  // the line itself: core/progress.hpp, opened by main.cpp

    const std::string out_dir = a.output_dir.empty() ? default_map_directory(a.grid) : a.output_dir;
    atomic_directory dir(out_dir, map_file_names());  // before the work, so that an unusable target fails at once
    const barrier_map m = make_barrier_map(a.grid, o);
    print_warnings(m.grid.warnings, m.grid.path);
    print_notes(m.grid.notes, m.grid.path);
    require_fitted_pixel(m);
    write_map_directory(m, o, dir, {figure, !a.no_figures, {"tipgap map", TIPGAP_VERSION, resolved_threads(o.read)}, t0});
    dir.commit();
    if (!a.quiet) fmt::print("{}", map_summary_text(m, out_dir));
}

}  // namespace

command map_command() {
    auto a = std::make_shared<map_args>();
    command cmd{"map", "Barrier-height maps of a spectroscopy grid (one long CSV, or a directory of curve files with x/y metadata)"};
    cmd.flags = {
        {"grid",
         "Grid CSV ('x [nm],y [nm],z [nm],current [pA]', one row per sample, each pixel's rows together) or a directory "
         "of curve files",
         &a->grid, "GRID", true},
        {"--output-dir",
         "Directory to write (replaced whole when it holds an earlier map; default: GRID without its extension + '_map')",
         &a->output_dir, "DIR"},
        {"--threads", "Worker threads (default 0 = all cores); results do not depend on it", &a->threads, "N"},
        {"--quiet", "No progress bar and no summary on stdout", &a->quiet},
        {"--no-figures", "Write the matrices and summary.json only, not the four PNG figures (faster)", &a->no_figures},
        {"--partial", "Map an aborted acquisition: missing pixels get quality 'missing' and NaN, a last row or pixel "
                      "cut short is left out or fitted as it is",
         &a->partial},
    };
    for (const flag& f : read_flag_list(a->read, true)) cmd.flags.push_back(f);
    for (const flag& f : fit_flag_list(a->flags, false)) cmd.flags.push_back(f);
    cmd.flags.push_back({"--min-decades", "Quality 'poor_fit' when the used points span fewer decades of current (default 1)",
                         &a->min_decades, "DECADES"});
    cmd.flags.push_back({"--max-relative-error",
                         "Quality 'poor_fit' when the standard error of the barrier exceeds this fraction of it (default 0.1)",
                         &a->max_relative_error, "FRACTION"});
    cmd.flags.push_back({"--range", "Colour scale of barrier_map.png, MIN..MAX (e.g. 4.0eV..4.8eV; default: 1st to 99th percentile)",
                         &a->range, "MIN..MAX"});
    cmd.run = [a](const std::string&) { run(*a); };
    return cmd;
}

}  // namespace tipgap::cli
