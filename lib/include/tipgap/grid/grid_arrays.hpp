#pragma once
// A spectroscopy grid held in memory (e.g. arrays from the user's own reader, through the Python
// module), visited pixel by pixel like a grid file (grid.hpp), so that make_barrier_map fits it
// with exactly the code that maps a file.
#include <cstddef>
#include <limits>
#include <span>
#include <string>
#include <vector>

#include "tipgap/grid/grid.hpp"

namespace tipgap {

struct grid_arrays {
    std::string name = "<arrays>";     // names the grid in messages and in the map's summary
    std::vector<double> x_m;           // pixel columns (m): finite, strictly ascending, >= 1 value
    std::vector<double> y_m;           // pixel rows (m): finite, strictly ascending, >= 1 value
    std::size_t samples = 0;           // samples per pixel, >= 1
    // z (m), finite: `samples` values shared by every pixel, or one run of `samples` per pixel in
    // the order of current_A.
    std::span<const double> z_m;
    // Current (A), finite: y_m.size() * x_m.size() runs of `samples`, row-major (iy, then ix).
    std::span<const double> current_A;
    double bias_V = std::numeric_limits<double>::quiet_NaN();  // sample bias (V); NaN: unknown
};

// Visits every pixel of `g` on resolved_threads(options) workers (slot = worker index; options.progress
// is not called) and returns its layout (path = g.name, metadata `bias` when known, arrays = true).
// Throws tipgap::error (input) with key "x", "y", "z" or "current" when the sizes do not match, a
// value is not finite, or positions are not strictly ascending; no pixel is visited then.
grid_layout visit_grid_arrays(const grid_arrays& g, const grid_read_options& options, const grid_visitor& visit);

}  // namespace tipgap
