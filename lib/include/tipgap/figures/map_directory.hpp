#pragma once
// The content of a `tipgap map` output directory: the matrices and quality codes (tipgap/grid/
// map_files.hpp), the four figures (map_figures.hpp) and summary.json, written into an
// atomic_directory that the caller commits.
#include <chrono>

#include "tipgap/figures/map_figures.hpp"
#include "tipgap/grid/map.hpp"
#include "tipgap/grid/map_files.hpp"
#include "tipgap/io/atomic_directory.hpp"

namespace tipgap {

struct map_directory_options {
    map_figure_options figure = {};  // colour range of barrier_map.png
    bool figures = true;             // false: matrices and summary.json only, no PNG figures
    // Generator, version and threads for summary.json; its output_seconds and total_seconds are
    // filled in here (total: from `started`, e.g. the start of the run, to the end of the figures).
    map_run run = {};
    std::chrono::steady_clock::time_point started = std::chrono::steady_clock::now();
};

// Writes every file of map_file_names() (the figures only with d.figures) into dir's temporary
// directory, each atomically: the matrices on a second thread while this one draws the figures
// (PLplot is used from the calling thread only). o: the options m was made with. Throws
// tipgap::error (input) when a file cannot be written.
void write_map_directory(const barrier_map& m, const map_options& o, const atomic_directory& dir,
                         map_directory_options d);

}  // namespace tipgap
