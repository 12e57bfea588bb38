#pragma once
// Barrier-height maps of spectroscopy grids: one fit per pixel (fit.hpp's linear model through a
// lean per-pixel path with fit_sweep's point selection, or fit_sweep for the offset model), a
// quality code per pixel, matrices in ascending x and y, and summary statistics of the apparent
// barrier height.
#include <array>
#include <cstddef>
#include <cstdint>
#include <functional>
#include <string>
#include <string_view>
#include <vector>

#include "tipgap/fit/fit.hpp"
#include "tipgap/grid/grid.hpp"

namespace tipgap {

// Per-pixel quality. One code per pixel; when several apply, the first in this list wins.
// Pixels with codes ok, saturated and contact carry values (the fit used only the points below
// saturation and outside contact); too_few_points and poor_fit pixels are NaN in the maps.
enum class pixel_quality : std::uint8_t {
    ok = 0,              // fitted, nothing to report
    too_few_points = 1,  // fewer than 3 points above the noise floor (and below saturation, outside contact)
    saturated = 2,       // fitted, but some points were at or above the saturation level and left out
    contact = 3,         // fitted, but a point contact (jump or plateau) was found and its points left out
    poor_fit = 4,        // fitted but not trustworthy: decay constant <= 0, the used points span
                         // less than map_options::min_current_decades, a relative standard error
                         // of φ_ap above map_options::max_relative_stderr, or the offset model
                         // did not converge
    missing = 5,         // no curve in the file: a grid node of an aborted acquisition (--partial)
};
inline constexpr std::size_t pixel_quality_count = 6;
template <>
struct enum_names<pixel_quality> {
    static constexpr enum_name<pixel_quality> table[] = {{pixel_quality::ok, "ok"},
                                                         {pixel_quality::too_few_points, "too_few_points"},
                                                         {pixel_quality::saturated, "saturated"},
                                                         {pixel_quality::contact, "contact"},
                                                         {pixel_quality::poor_fit, "poor_fit"},
                                                         {pixel_quality::missing, "missing"}};
};
// Precedence when several codes apply: too_few_points, poor_fit, contact, saturated, ok.

struct map_options {
    fit_options fit{.model = fit_model::linear};  // as for tipgap fit but linear by default (speed; the profile window is not used)
    // poor_fit when the used points span fewer decades of current than this (> 0; fit_sweep warns
    // below 1 decade, common practice, no source).
    double min_current_decades = 1.0;
    // poor_fit when the standard error of φ_ap exceeds this fraction of φ_ap (> 0; 0.1, common
    // practice, no source). The standard error is scaled by the residuals (fit.hpp), so a curve that
    // does not follow one exponential (a tip change, a double tip) has a large one, whatever the
    // noise estimate.
    double max_relative_stderr = 0.1;
    grid_read_options read;                // threads, chunk size, progress

    // Throws tipgap::error (input, naming the field) for out-of-range values.
    void validate() const;
};

// Statistics of the finite values of one map (barrier heights in J).
struct map_statistics {
    std::size_t count = 0;                 // pixels with a value
    double mean = 0.0;
    double median = 0.0;
    double standard_deviation = 0.0;       // sample (n - 1); 0 for one value
    double robust_spread = 0.0;            // 1.4826 · MAD, a Gaussian σ that ignores outliers
    double min = 0.0;
    double max = 0.0;
    // Percentiles 1, 5, 25, 75, 95, 99 by linear interpolation between order statistics
    // (Hyndman & Fan, Am. Stat. 50, 361 (1996), definition 7; numpy.percentile's default).
    std::array<double, 6> percentiles{};
    static constexpr std::array<double, 6> percentile_levels{1, 5, 25, 75, 95, 99};
};

// Statistics of the finite entries of `values` (NaN entries are skipped; all NaN: count 0, NaN fields).
map_statistics summarize(const std::vector<double>& values);

struct barrier_map {
    grid_layout grid;                      // positions, metadata, samples, bytes
    std::size_t nx = 0, ny = 0;
    double pitch_x_m = 0.0, pitch_y_m = 0.0;  // median spacing of the positions (0 for one column/row)
    bool uniform_pitch = true;             // every spacing within 1e-6 relative of the median
    // Row-major matrices, index iy * nx + ix (ascending x within a row, rows in ascending y).
    std::vector<double> decay_constant_per_m;          // κ, 1/m; NaN without a value
    std::vector<double> decay_constant_stderr_per_m;   // 1/m
    std::vector<double> apparent_barrier_J;            // φ_ap, J
    std::vector<double> apparent_barrier_stderr_J;     // J
    std::vector<double> r_squared;                     // of the fit (NaN for too_few_points)
    std::vector<std::uint32_t> points_used;            // per pixel
    std::vector<pixel_quality> quality;
    std::array<std::size_t, pixel_quality_count> quality_counts{};
    map_statistics barrier;                // over the pixels with a value
    double read_and_fit_seconds = 0.0;     // wall time of read_grid with the fits
};

// Reads the grid at `path` (grid.hpp) and fits every pixel. Results do not depend on the thread
// count: each pixel's fit depends only on its samples, and results are placed by position.
// Throws tipgap::error (input) for a bad grid (see read_grid) or bad options.
barrier_map make_barrier_map(const std::string& path, const map_options& options);

// Where make_barrier_map's pixels come from: visits every pixel (concurrently, slots as for
// read_grid) and returns the layout, e.g. read_grid on a path or visit_grid_arrays (grid_arrays.hpp).
using grid_source = std::function<grid_layout(const grid_visitor& visit)>;
// The same for any source; options.read.threads must match the slots the source uses.
barrier_map make_barrier_map(const grid_source& source, const map_options& options);

}  // namespace tipgap
