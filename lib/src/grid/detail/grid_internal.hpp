#pragma once
// Internals shared by the grid readers (grid_csv.cpp, grid_dir.cpp) and the grid check.
#include <cstdint>
#include <string>
#include <vector>

#include "tipgap/grid/grid.hpp"

namespace tipgap::detail {

// One pixel as found in the input: position, where it starts, how many samples it has.
struct pixel_run {
    double x_m = 0.0;
    double y_m = 0.0;
    std::int64_t line = 0;          // first row's line (0 for a directory)
    std::uint64_t samples = 0;
    std::uint32_t file_index = 0;   // index into the file names (0 for a long CSV)
};

// Checks that `runs` (in file order) fill a rectangular grid, each (x, y) exactly once, and (when
// equal_counts) that every pixel has the first pixel's number of samples; fills layout.x_m,
// layout.y_m and layout.pixels. files: the file of each file_index. Throws tipgap::error (input).
// partial (grid_read_options::partial): holes are counted in layout.missing, and the last run may
// have fewer samples than the first.
void check_grid(const std::vector<pixel_run>& runs, const std::vector<std::string>& files, bool equal_counts,
                grid_layout& layout, bool partial = false);

// "(x = 3 nm, y = 5 nm)" for messages.
std::string format_pixel(double x_m, double y_m);

grid_layout read_grid_csv(const std::string& path, const grid_read_options& options, const grid_visitor& visit);
grid_layout read_grid_directory(const std::string& path, const grid_read_options& options, const grid_visitor& visit);

}  // namespace tipgap::detail
