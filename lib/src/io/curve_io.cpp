#include "tipgap/io/curve_io.hpp"

#include "io/detail/read_capped.hpp"

#include <algorithm>
#include <cctype>
#include <cstdint>
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <iterator>

#include "io/detail/csv_errors.hpp"
#include "io/detail/csv_header.hpp"
#include "io/detail/csv_scan.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"
#include "tipgap/io/orientation.hpp"

namespace tipgap {
namespace {

using detail::iequals;

constexpr std::size_t min_curve_points = 3;

// The columns of a curve file, in the order of column_role.
enum class column_role { z, current, direction, ignored };
constexpr detail::column_rule curve_columns[] = {
    {"z", "", dimension::length, "z [nm]", true},
    {"current", "I", dimension::current, "current [nA]", true},
    {"direction", "", std::nullopt, "", false},
};
constexpr detail::csv_format curve_format{curve_columns, "'z [nm],current [nA]'", "--columns 1,2 --z-unit nm --current-unit pA"};
// z and current: the roles reader_options::columns names.
constexpr std::size_t curve_roles = 2;

column_role role_of(const detail::column_descriptor& d) {
    return d.rule < 0 ? column_role::ignored : static_cast<column_role>(d.rule);
}

}  // namespace

const std::string* curve_metadata::find(std::string_view key) const {
    for (const auto& [k, v] : entries) {
        if (k == key) return &v;
    }
    return nullptr;
}

std::vector<curve_sweep> split_at_turns(const std::vector<double>& z_m, const std::vector<double>& current_A,
                                        double turn_fraction) {
    std::vector<curve_sweep> out;
    const std::size_t n = z_m.size();
    if (n == 0) return out;
    auto [lo, hi] = std::minmax_element(z_m.begin(), z_m.end());
    const double threshold = turn_fraction * (*hi - *lo);

    // Cut points: indices of the running extremes at which z turned back by more than threshold.
    std::vector<std::size_t> cuts{0};
    int dir = 0;  // +1 retracting, -1 approaching, 0 not yet known
    std::size_t extreme = 0;
    for (std::size_t i = 1; i < n; ++i) {
        if (dir == 0) {
            if (z_m[i] - z_m[0] > threshold) dir = +1;
            else if (z_m[0] - z_m[i] > threshold) dir = -1;
            // The extreme so far in the not-yet-known direction is tracked by the first branch below.
            if (dir != 0) {
                extreme = 0;
                for (std::size_t j = 1; j <= i; ++j) {
                    if (dir > 0 ? z_m[j] > z_m[extreme] : z_m[j] < z_m[extreme]) extreme = j;
                }
            }
            continue;
        }
        if (dir > 0 ? z_m[i] >= z_m[extreme] : z_m[i] <= z_m[extreme]) {
            extreme = i;
        } else if (std::abs(z_m[i] - z_m[extreme]) > threshold) {
            cuts.push_back(extreme);
            dir = -dir;
            // The new sweep starts at the turning point; track its extreme from there.
            std::size_t start = extreme;
            extreme = start;
            for (std::size_t j = start; j <= i; ++j) {
                if (dir > 0 ? z_m[j] > z_m[extreme] : z_m[j] < z_m[extreme]) extreme = j;
            }
        }
    }
    cuts.push_back(n - 1);

    for (std::size_t k = 0; k + 1 < cuts.size(); ++k) {
        // The turning point belongs to the sweep that ends there; the next sweep starts after it.
        std::size_t begin = k == 0 ? cuts[k] : cuts[k] + 1;
        std::size_t end = cuts[k + 1] + 1;  // exclusive
        if (begin >= end) continue;
        curve_sweep s;
        s.first_row = begin;
        s.z_m.assign(z_m.begin() + static_cast<std::ptrdiff_t>(begin), z_m.begin() + static_cast<std::ptrdiff_t>(end));
        s.current_A.assign(current_A.begin() + static_cast<std::ptrdiff_t>(begin),
                           current_A.begin() + static_cast<std::ptrdiff_t>(end));
        double dz = s.z_m.back() - s.z_m.front();
        s.direction = std::abs(dz) <= threshold ? sweep_direction::unknown
                      : dz < 0                  ? sweep_direction::approach
                                                : sweep_direction::retract;
        out.push_back(std::move(s));
    }
    return out;
}

namespace {

// The number of cells a row may have under `columns` header columns: exactly that many, or more
// when the extra ones are empty (trailing delimiters).
bool cell_count_fits(std::string_view line, detail::csv_dialect d, std::size_t columns) {
    const int n = detail::count_cells(line, d);
    return n == static_cast<int>(columns) || (n > static_cast<int>(columns) && detail::count_filled_cells(line, d) <= static_cast<int>(columns));
}

// One data row: z and current in SI, and its direction label (unknown without the column).
void read_row(std::string_view line, int row_line, const detail::csv_preamble& pre, const std::string& file, double& z,
              double& current, sweep_direction& dir) {
    const std::vector<detail::column_descriptor>& columns = pre.header.columns;
    detail::cell_cursor cells(line, pre.dialect);
    std::string_view cell;
    int column = 0;
    for (std::size_t c = 0; c < columns.size() && cells.next(cell, column); ++c) {
        const column_role role = role_of(columns[c]);
        if (role == column_role::z || role == column_role::current) {
            double v = 0.0;
            const detail::number_status st = detail::parse_cell(cell, pre.dialect, v);
            if (st != detail::number_status::ok)
                detail::throw_bad_number(location{file, row_line, column, ""}, columns[c].name, cell, st);
            (role == column_role::z ? z : current) = v * columns[c].scale;
        } else if (role == column_role::direction && !from_string(cell, dir)) {
            throw_input(location{file, row_line, column, ""},
                        fmt::format("{} in column 'direction' is not a sweep direction; expected approach or retract",
                                    quote_input(cell)));
        }
    }
}

// The data rows after the header: z and current in SI, and each row's direction when the file
// has a direction column (then `directions` gets one entry per row).
void read_rows(std::string_view text, const detail::csv_preamble& pre, const std::string& file, measured_curve& curve,
               std::vector<sweep_direction>& directions) {
    const std::size_t n_columns = pre.header.columns.size();
    // One reservation up front, then no allocation per row.
    const std::size_t line_estimate = static_cast<std::size_t>(std::count(text.begin(), text.end(), '\n')) + 1;
    curve.z_m.reserve(line_estimate);
    curve.current_A.reserve(line_estimate);
    if (curve.has_direction_column) directions.reserve(line_estimate);
    detail::line_cursor lines(text.substr(pre.data_offset), pre.header.line);
    std::string_view line;
    while (lines.next(line)) {
        std::string_view t = detail::trim_cell(line);
        if (t.empty() || t.front() == '#') continue;
        const int row_line = lines.line_number();
        if (!cell_count_fits(line, pre.dialect, n_columns)) {
            detail::throw_cell_count(location{file, row_line, 1, ""}, detail::reported_cell_count(line, pre.dialect, n_columns),
                                     pre.header.describe(), n_columns);
        }
        double z = 0.0, current = 0.0;
        sweep_direction dir = sweep_direction::unknown;
        read_row(line, row_line, pre, file, z, current, dir);
        curve.z_m.push_back(z);
        curve.current_A.push_back(current);
        if (curve.has_direction_column) directions.push_back(dir);
    }
}

// A curve whose |I| clearly rises with z is refused: its z grows as the tip approaches.
void refuse_rising_current(const measured_curve& curve, bool flipped) {
    const orientation_check o = check_orientation(curve.z_m, curve.current_A);
    if (o.orientation != z_orientation::current_rises) return;
    detail::throw_rising_current(location{curve.file, 0, 0, ""},
                                 fmt::format("median {:.3g} A over the quarter of the points with the largest z, {:.3g} A "
                                             "over the quarter with the smallest",
                                             o.far_median_A, o.near_median_A),
                                 flipped);
}

// Sweeps are the runs of equal direction labels.
std::vector<curve_sweep> sweeps_by_label(const measured_curve& curve, const std::vector<sweep_direction>& directions) {
    std::vector<curve_sweep> out;
    std::size_t begin = 0;
    for (std::size_t i = 1; i <= directions.size(); ++i) {
        if (i == directions.size() || directions[i] != directions[begin]) {
            curve_sweep s;
            s.direction = directions[begin];
            s.first_row = begin;
            s.z_m.assign(curve.z_m.begin() + static_cast<std::ptrdiff_t>(begin),
                         curve.z_m.begin() + static_cast<std::ptrdiff_t>(i));
            s.current_A.assign(curve.current_A.begin() + static_cast<std::ptrdiff_t>(begin),
                               curve.current_A.begin() + static_cast<std::ptrdiff_t>(i));
            out.push_back(std::move(s));
            begin = i;
        }
    }
    return out;
}

}  // namespace

measured_curve parse_curve_csv(std::string_view text, const std::string& file, const reader_options& options) {
    options.validate(curve_roles);
    measured_curve curve;
    curve.file = file;
    detail::csv_preamble pre = detail::read_preamble(text, true, file, curve_format,
                                                     detail::choice_of(options, {options.z_unit, options.current_unit, ""}));
    curve.metadata = std::move(pre.metadata);
    curve.notes = std::move(pre.header.notes);
    detail::apply_overrides(options, curve.metadata, curve.notes);
    curve.has_direction_column = pre.header.find(static_cast<int>(column_role::direction)) >= 0;
    if (options.flip_z) pre.header.columns[pre.header.find(static_cast<int>(column_role::z))].scale *= -1.0;
    std::vector<sweep_direction> directions;
    read_rows(text, pre, file, curve, directions);
    if (curve.z_m.size() < min_curve_points) {
        throw_input(location{file, 0, 0, ""},
                    fmt::format("only {} data row{}; a curve needs at least {} points", curve.z_m.size(),
                                curve.z_m.size() == 1 ? "" : "s", min_curve_points));
    }
    refuse_rising_current(curve, options.flip_z);
    curve.sweeps = curve.has_direction_column ? sweeps_by_label(curve, directions) : split_at_turns(curve.z_m, curve.current_A);
    return curve;
}

measured_curve read_curve_csv(const std::string& path, const reader_options& options) {
    const std::string text = detail::read_capped(path, detail::stream_cap_bytes, true, "a curve file (CSV)");
    return parse_curve_csv(text, path, options);
}

}  // namespace tipgap
