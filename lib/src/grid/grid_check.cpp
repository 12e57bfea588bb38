// Does a set of pixels form a grid? Repeated pixels, unequal sample counts and holes are input
// errors, reported in that order (a repeated pixel also splits its sample count, and is the more
// telling message), each at the earliest offending line.
#include <algorithm>
#include <filesystem>
#include <thread>
#include <fmt/format.h>
#include <limits>
#include <numeric>

#include "grid/detail/grid_internal.hpp"
#include "tipgap/grid/grid.hpp"

namespace tipgap {
namespace detail {

std::string format_pixel(double x_m, double y_m) { return fmt::format("(x = {:g} nm, y = {:g} nm)", x_m / 1e-9, y_m / 1e-9); }

namespace {

location where_of(const pixel_run& r, const std::vector<std::string>& files) {
    location w;
    w.file = files.at(r.file_index);
    w.line = r.line > std::numeric_limits<int>::max() ? 0 : static_cast<int>(r.line);
    w.column = r.line > 0 ? 1 : 0;
    return w;
}

std::string describe(const pixel_run& r, const std::vector<std::string>& files) {
    return r.line > 0 ? fmt::format("line {}", r.line) : files.at(r.file_index);
}

// Indices of the runs ordered by position (y, then x), then by file order, so that a repeat
// follows its first occurrence.
std::vector<std::size_t> by_position(const std::vector<pixel_run>& runs) {
    std::vector<std::size_t> order(runs.size());
    std::iota(order.begin(), order.end(), std::size_t{0});
    std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
        const pixel_run &p = runs[a], &q = runs[b];
        if (p.y_m != q.y_m) return p.y_m < q.y_m;
        if (p.x_m != q.x_m) return p.x_m < q.x_m;
        return a < b;
    });
    return order;
}

// The earliest run (in file order) that repeats a position, reported with the first occurrence.
void throw_on_repeat(const std::vector<pixel_run>& runs, const std::vector<std::size_t>& order,
                     const std::vector<std::string>& files) {
    std::size_t repeat = runs.size(), first_of_repeat = 0;
    for (std::size_t k = 1; k < order.size(); ++k) {
        const pixel_run &p = runs[order[k - 1]], &q = runs[order[k]];
        if (p.x_m == q.x_m && p.y_m == q.y_m && order[k] < repeat) {
            repeat = order[k];
            // The first occurrence of this position: walk back over equal positions.
            std::size_t j = k - 1;
            while (j > 0 && runs[order[j - 1]].x_m == q.x_m && runs[order[j - 1]].y_m == q.y_m) --j;
            first_of_repeat = order[j];
        }
    }
    if (repeat == runs.size()) return;
    const pixel_run& r = runs[repeat];
    throw_input(where_of(r, files),
                fmt::format("pixel {} appears again (first at {}); each pixel's rows must be together, with "
                            "every pixel once (rows of different pixels interleaved, or a pixel repeated?)",
                            format_pixel(r.x_m, r.y_m), describe(runs[first_of_repeat], files)));
}

// The hint of an error that an aborted acquisition gives.
constexpr const char* partial_hint = "; if the acquisition was aborted, 'tipgap map --partial' maps the pixels that are there";

void throw_on_unequal_counts(const std::vector<pixel_run>& runs, const std::vector<std::string>& files, bool partial) {
    for (const pixel_run& r : runs) {
        // An aborted acquisition cuts its last pixel short.
        if (partial && &r == &runs.back() && r.samples < runs.front().samples) continue;
        if (r.samples != runs.front().samples) {
            throw_input(where_of(r, files),
                        fmt::format("pixel {} has {} samples; the first pixel ({}) has {}; every pixel needs the "
                                    "same number{}",
                                    format_pixel(r.x_m, r.y_m), r.samples, describe(runs.front(), files),
                                    runs.front().samples,
                                    &r == &runs.back() ? std::string(" (is the file cut short?)") + partial_hint : ""));
        }
    }
}

// The distinct values of one coordinate of the runs, ascending.
std::vector<double> distinct(const std::vector<pixel_run>& runs, double pixel_run::*coordinate) {
    std::vector<double> v;
    v.reserve(runs.size());
    for (const pixel_run& r : runs) v.push_back(r.*coordinate);
    std::sort(v.begin(), v.end());
    v.erase(std::unique(v.begin(), v.end()), v.end());
    return v;
}

// Without repeats, fewer pixels than positions: names the first hole in (y, x) order.
[[noreturn]] void throw_hole(const std::vector<pixel_run>& runs, const std::vector<std::size_t>& order,
                             const std::vector<double>& xs, const std::vector<double>& ys,
                             const std::vector<std::string>& files) {
    std::size_t k = 0;
    double hole_x = xs.front(), hole_y = ys.front();
    bool found = false;
    for (std::size_t iy = 0; iy < ys.size() && !found; ++iy) {
        for (std::size_t ix = 0; ix < xs.size() && !found; ++ix) {
            if (k < order.size() && runs[order[k]].x_m == xs[ix] && runs[order[k]].y_m == ys[iy]) {
                ++k;
            } else {
                hole_x = xs[ix];
                hole_y = ys[iy];
                found = true;
            }
        }
    }
    throw_input(location{files.front(), 0, 0, ""},
                fmt::format("the pixels do not fill a grid: {} pixels for {} x values times {} y values; pixel {} "
                            "is missing (is the file cut short?){}",
                            runs.size(), xs.size(), ys.size(), format_pixel(hole_x, hole_y), partial_hint));
}

}  // namespace

void check_grid(const std::vector<pixel_run>& runs, const std::vector<std::string>& files, bool equal_counts,
                grid_layout& layout, bool partial) {
    if (runs.empty()) {
        throw_input(location{files.empty() ? layout.path : files.front(), 0, 0, ""},
                    "no data rows after the header; expected one row per sample such as '0,0,0.01,812.5' under "
                    "'x [nm],y [nm],z [nm],current [pA]'");
    }
    const std::vector<std::size_t> order = by_position(runs);
    throw_on_repeat(runs, order, files);
    if (equal_counts) throw_on_unequal_counts(runs, files, partial);
    std::vector<double> xs = distinct(runs, &pixel_run::x_m), ys = distinct(runs, &pixel_run::y_m);
    if (xs.size() * ys.size() != runs.size() && !partial) throw_hole(runs, order, xs, ys, files);
    layout.missing = xs.size() * ys.size() - runs.size();
    layout.x_m = std::move(xs);
    layout.y_m = std::move(ys);
    layout.pixels = layout.x_m.size() * layout.y_m.size();
}

}  // namespace detail

unsigned resolved_threads(const grid_read_options& options) {
    if (options.threads > 0) return static_cast<unsigned>(options.threads);
    return std::max(1u, std::thread::hardware_concurrency());
}

grid_layout read_grid(const std::string& path, const grid_read_options& options, const grid_visitor& visit) {
    std::error_code ec;
    if (std::filesystem::is_directory(path, ec)) return detail::read_grid_directory(path, options, visit);
    return detail::read_grid_csv(path, options, visit);
}

}  // namespace tipgap
