#pragma once
// The files of a barrier map, as `tipgap map` writes them into its output directory: one matrix
// CSV per quantity, the quality codes, and summary.json. Formats only; the figures are in
// tipgap/figures/map_figures.hpp.
#include <string>
#include <vector>

#include "tipgap/grid/map.hpp"
#include "tipgap/io/columns.hpp"

namespace tipgap {

// Every file of a map directory, figures included, in the order they are written.
const std::vector<std::string>& map_file_names();

// A matrix file: '#' lines saying what it holds (`what`, with its unit) and the x and y positions
// (nm), then one row per y (ascending), one column per x; the shortest text that reads back to
// the same double, "NaN" without a value. values: row-major, m.nx * m.ny, scaled by `scale`.
std::string map_matrix_csv(const barrier_map& m, const std::string& what, const std::vector<double>& values,
                           const scaling& scale);

// The quality code of each pixel (0 ok ... 4 poor_fit, explained in the first line).
std::string map_quality_csv(const barrier_map& m);

// How a map run went: who wrote it, threads, times (s).
struct map_run {
    std::string generator = "tipgap map";
    std::string version;
    unsigned threads = 0;
    double output_seconds = 0.0;  // writing the matrices and figures
    double total_seconds = 0.0;   // from the start to the end of the figures
};

// Statistics of one map (count, mean, median, standard deviation, robust spread, min, max,
// percentiles p01..p99), scaled to the output unit.
std::vector<column<map_statistics>> map_statistics_columns(const scaling& scale);

// summary.json: generator, version, grid (path, layout, size, extent and pitch in nm), the file's
// metadata, the fit options, statistics of phi_ap (eV), kappa (1/nm) and the standard error of
// phi_ap (eV), quality codes and counts, warnings, then the run-dependent threads and timings.
record map_summary(const barrier_map& m, const map_options& o, const map_run& run);

// The default output directory of a grid: its path without the extension (and without a trailing
// '/') plus "_map": "scan.csv" -> "scan_map", "pixels/" -> "pixels_map".
std::string default_map_directory(const std::string& grid);

// The summary lines under "tipgap map: <nx> x <ny> pixels, <samples> samples -> <out_dir>": the
// apparent barrier (median ± MAD-based σ and mean ± standard deviation, eV), the quality counts
// and, for a partial grid, how many pixels are missing. One line each, '\n'-terminated.
std::string map_summary_text(const barrier_map& m, const std::string& out_dir);

}  // namespace tipgap
