#pragma once
// Reading spectroscopy grids: one I(z) curve per pixel of a lateral x-y grid, streamed.
//
// Two layouts are accepted:
//  * one long CSV file:
//      # bias: 100 mV                     optional metadata, as for single curves (curve_io.hpp)
//      x [nm],y [nm],z [nm],current [pA]  header: columns x, y, z, current (any order) with units;
//      0,0,0.0000,1000.3                  other named columns are read past and ignored
//      0,0,0.0039,923.1                   one row per sample; each pixel's rows together;
//      ...                                pixels in any order
//    '#' lines and blank lines between rows are skipped. Every pixel must have the same number of
//    samples (the first pixel's count), which is what exposes a file cut at a line end.
//  * a directory of single-curve files (*.csv, read with read_curve_csv), one pixel each, whose
//    metadata carry `x` and `y`; a pixel's samples are the file's first sweep.
// Other delimiters, column names, units, header-less files and z orientation as for curves
// (grid_read_options::reader); a grid whose pixels' |I| mostly rise with z is refused.
// Either way the pixels must fill a rectangular grid: the distinct x values times the distinct y
// values, each (x, y) exactly once. Violations are input errors naming file, line and column:
// a pixel that appears again after other pixels ("unsorted" rows), a missing pixel, a pixel with
// a different number of samples, a cut-off row.
//
// Memory: the long CSV is read in chunks (grid_read_options::chunk_bytes) handed to worker
// threads that parse them and visit the complete pixels inside; pixels that straddle two chunks
// are joined on the calling thread. At most threads + 2 chunks are in memory at once, whatever
// the file size.
#include <cstddef>
#include <cstdint>
#include <functional>
#include <span>
#include <string>
#include <vector>

#include "tipgap/io/curve_io.hpp"
#include "tipgap/io/reader_options.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap {

// One pixel handed to a visitor. The spans are valid only during the call.
struct grid_pixel_view {
    double x_m = 0.0;                      // lateral position, m
    double y_m = 0.0;                      // m
    std::span<const double> z_m;           // samples in file order, m
    std::span<const double> current_A;     // A, same length
    double bias_V = 0.0;                   // from the metadata, V; NaN when not given
    location where;                        // file and line of the pixel's first row (line 0 for a
                                           // directory: the file is the pixel's curve file)
};

struct grid_read_options {
    // Worker threads that parse and visit (>= 0; 0 = hardware concurrency).
    int threads = 0;
    // Bytes read per chunk of a long CSV (>= 4096; a row longer than this is an error). 1 MB
    // keeps a chunk in cache between the read, the line count and the parse: measured 20-30 %
    // less CPU than 8 MB chunks on a 169 MB grid (tests/bench/grid_bench.py, README Performance).
    std::size_t chunk_bytes = std::size_t{1} << 20;
    // Called on the calling thread after each chunk (long CSV) or file (directory) with the
    // bytes read so far and the total; may be empty.
    std::function<void(std::uint64_t done_bytes, std::uint64_t total_bytes)> progress;
    // Delimiter, columns (x, y, z, current), units, z orientation, bias and temperature; for a
    // directory, applied to every curve file (tipgap/io/reader_options.hpp).
    reader_options reader;
    // An aborted acquisition: pixels missing from the grid are counted (grid_layout::missing)
    // instead of refused, the last pixel in file order may have fewer samples than the first, and
    // a long CSV's last line without a line end is left out (a warning says so).
    bool partial = false;
};

// What was read.
struct grid_layout {
    std::string path;                      // as given
    bool directory = false;                // a directory of curve files
    bool arrays = false;                   // arrays in memory (grid_arrays.hpp), not a file
    curve_metadata metadata;               // the long CSV's '#' lines; for a directory the first
                                           // file's (by name)
    std::vector<double> x_m;               // distinct x values, ascending, m
    std::vector<double> y_m;               // distinct y values, ascending, m
    std::size_t pixels = 0;                // x_m.size() * y_m.size()
    std::size_t missing = 0;               // grid nodes without a pixel (only with options.partial)
    std::uint64_t samples = 0;             // rows (or points) read in all
    std::uint64_t bytes = 0;               // bytes read
    std::vector<std::string> warnings;     // e.g. a missing line end at the end of the file
    std::vector<std::string> notes;        // what the reader options decided against the file
                                           // (curve_io.hpp, measured_curve::notes)
};

// Called once per pixel, concurrently: `slot` in [0, threads] identifies the calling thread
// (threads = the resolved worker count), so that a visitor can keep per-thread state without
// locking. The visiting order is unspecified. An exception from the visitor stops the reading
// and is rethrown by read_grid.
using grid_visitor = std::function<void(const grid_pixel_view& pixel, unsigned slot)>;

// Number of worker threads read_grid uses for `options` (so that callers can size per-slot state:
// slots are 0 .. resolved_threads(options)).
unsigned resolved_threads(const grid_read_options& options);

// Reads a grid (a long CSV file or a directory of curve files) and visits every pixel.
// path: file or directory. Throws tipgap::error (input) naming file:line:column for unreadable
// files, a bad header or cell, a pixel repeated after other pixels, pixels that do not fill the
// grid, unequal sample counts, fewer than 1 pixel, or |I| rising with z in most pixels; the visitor
// may have seen some pixels by then. Bad reader options throw as reader_options::validate(4).
grid_layout read_grid(const std::string& path, const grid_read_options& options, const grid_visitor& visit);

}  // namespace tipgap
