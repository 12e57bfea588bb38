#include "tipgap/io/curve_io.hpp"

#include <algorithm>
#include <cctype>
#include <cstdint>
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <iterator>

#include "io/detail/csv_header.hpp"
#include "io/detail/csv_scan.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap {
namespace {

using detail::iequals;
using detail::parse_metadata_line;
using detail::split_header_cell;
using detail::unit_factor;

constexpr std::size_t min_curve_points = 3;
constexpr const char* header_example = "'z [nm],current [nA]'";

enum class column_role { z, current, direction, ignored };

struct column_spec {
    column_role role = column_role::ignored;
    double factor = 1.0;  // SI per file unit
    std::string_view name;
};

[[noreturn]] void throw_cell(const std::string& file, int line, int column, std::string_view column_name,
                             std::string_view cell, detail::number_status status) {
    location where{file, line, column, ""};
    switch (status) {
        case detail::number_status::empty:
            throw_input(where, fmt::format("empty cell in column '{}'; expected a number", column_name));
        case detail::number_status::not_finite:
            throw_input(where, fmt::format("{} in column '{}' is not a finite number; expected a finite value", quote_input(cell), column_name));
        case detail::number_status::out_of_range:
            throw_input(where,
                        fmt::format("{} in column '{}' is outside the range of a double; expected a magnitude of 0 or "
                                    "between about 1e-308 and 1e308",
                                    quote_input(cell), column_name));
        default:
            throw_input(where, fmt::format("{} in column '{}' is not a number; expected a plain number such as 0.25 (the unit "
                                           "goes in the header)",
                                           quote_input(cell), column_name));
    }
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

measured_curve parse_curve_csv(std::string_view text, const std::string& file) {
    measured_curve curve;
    curve.file = file;
    if (text.find_first_not_of(" \t\r\n") == std::string_view::npos) {
        throw_input(location{file, 0, 0, ""},
                    fmt::format("the file is empty; expected a header row such as {} followed by data rows",
                                header_example));
    }

    detail::line_cursor lines(text);
    std::string_view line;

    // Metadata and comments, then the header.
    std::vector<column_spec> columns;
    int header_line = 0;
    int z_col = -1, current_col = -1, direction_col = -1;
    while (lines.next(line)) {
        std::string_view t = detail::trim_cell(line);
        if (t.empty()) continue;
        if (t.front() == '#') {
            parse_metadata_line(line, lines.line_number(), file, curve.metadata);
            continue;
        }
        header_line = lines.line_number();
        detail::cell_cursor cells(line);
        std::string_view cell;
        int column = 0;
        double probe = 0.0;
        bool first = true;
        while (cells.next(cell, column)) {
            location where{file, header_line, column, ""};
            if (first && detail::parse_double(cell, probe) == detail::number_status::ok) {
                throw_input(where, fmt::format("no header row: the first row holds numbers; expected a header "
                                               "such as {} before the data",
                                               header_example));
            }
            first = false;
            std::string_view name, unit;
            bool brackets = false;
            split_header_cell(cell, name, unit, brackets);
            column_spec spec;
            spec.name = name;
            if (iequals(name, "z") || iequals(name, "current")) {
                bool is_z = iequals(name, "z");
                if (!brackets || unit.empty()) {
                    throw_input(where, fmt::format("column '{}' has no unit; write it in brackets, e.g. '{}'", name,
                                                   is_z ? "z [nm]" : "current [nA]"));
                }
                spec.role = is_z ? column_role::z : column_role::current;
                spec.factor = unit_factor(unit, is_z ? dimension::length : dimension::current, cell, where);
                int& slot = is_z ? z_col : current_col;
                if (slot >= 0) throw_input(where, fmt::format("column '{}' appears twice in the header", name));
                slot = static_cast<int>(columns.size());
            } else if (iequals(name, "direction")) {
                spec.role = column_role::direction;
                if (direction_col >= 0) throw_input(where, "column 'direction' appears twice in the header");
                direction_col = static_cast<int>(columns.size());
            }
            columns.push_back(spec);
        }
        break;
    }
    if (header_line == 0) {
        throw_input(location{file, 0, 0, ""},
                    fmt::format("no header row: the file holds only '#' lines; expected a header such as {} "
                                "followed by data rows",
                                header_example));
    }
    if (z_col < 0 || current_col < 0) {
        throw_input(location{file, header_line, 1, ""},
                    fmt::format("the header has no '{}' column; expected a header such as {}",
                                z_col < 0 ? "z [<length unit>]" : "current [<current unit>]", header_example));
    }
    curve.has_direction_column = direction_col >= 0;

    // Rows: one reservation up front, then no allocation per row.
    const std::size_t line_estimate = static_cast<std::size_t>(std::count(text.begin(), text.end(), '\n')) + 1;
    curve.z_m.reserve(line_estimate);
    curve.current_A.reserve(line_estimate);
    std::vector<sweep_direction> directions;
    if (curve.has_direction_column) directions.reserve(line_estimate);
    const int n_columns = static_cast<int>(columns.size());
    while (lines.next(line)) {
        std::string_view t = detail::trim_cell(line);
        if (t.empty() || t.front() == '#') continue;
        const int row_line = lines.line_number();
        const int n_cells = detail::count_cells(line);
        if (n_cells != n_columns) {
            throw_input(location{file, row_line, 1, ""},
                        fmt::format("the row has {} cell{}; the header on line {} has {} columns", n_cells,
                                    n_cells == 1 ? "" : "s", header_line, n_columns));
        }
        detail::cell_cursor cells(line);
        std::string_view cell;
        int column = 0;
        double z = 0.0, current = 0.0;
        sweep_direction dir = sweep_direction::unknown;
        for (int c = 0; cells.next(cell, column); ++c) {
            const column_spec& spec = columns[static_cast<std::size_t>(c)];
            if (spec.role == column_role::z || spec.role == column_role::current) {
                double v = 0.0;
                detail::number_status st = detail::parse_double(cell, v);
                if (st != detail::number_status::ok) throw_cell(file, row_line, column, spec.name, cell, st);
                (spec.role == column_role::z ? z : current) = v * spec.factor;
            } else if (spec.role == column_role::direction) {
                if (!from_string(cell, dir)) {
                    throw_input(location{file, row_line, column, ""},
                                fmt::format("{} in column 'direction' is not a sweep direction; expected {}",
                                            quote_input(cell), accepted_names<sweep_direction>()));
                }
            }
        }
        curve.z_m.push_back(z);
        curve.current_A.push_back(current);
        if (curve.has_direction_column) directions.push_back(dir);
    }
    if (curve.z_m.size() < min_curve_points) {
        throw_input(location{file, 0, 0, ""},
                    fmt::format("only {} data row{}; a curve needs at least {} points", curve.z_m.size(),
                                curve.z_m.size() == 1 ? "" : "s", min_curve_points));
    }

    if (curve.has_direction_column) {
        // Sweeps are the runs of equal direction labels.
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
                curve.sweeps.push_back(std::move(s));
                begin = i;
            }
        }
    } else {
        curve.sweeps = split_at_turns(curve.z_m, curve.current_A);
    }
    return curve;
}

measured_curve read_curve_csv(const std::string& path) {
    std::error_code ec;
    if (std::filesystem::is_directory(path, ec)) {
        throw_input(location{path, 0, 0, ""}, "this is a directory; expected a curve file (CSV)");
    }
    std::ifstream in(path, std::ios::binary);
    if (!in) throw_input(location{path, 0, 0, ""}, "cannot open the file for reading");
    // One read of the whole file into a buffer of its size: a character-by-character copy takes
    // seconds and twice the memory on a file with a gigabyte-long line.
    std::string text;
    const std::uintmax_t size = std::filesystem::file_size(path, ec);
    if (!ec) {
        text.resize(static_cast<std::size_t>(size));
        in.read(text.data(), static_cast<std::streamsize>(size));
        text.resize(static_cast<std::size_t>(in.gcount()));
        // A file that grew while being read (or a pipe) still gets read to its end.
        text.append(std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>());
    } else {
        text.assign(std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>());
    }
    return parse_curve_csv(text, path);
}

}  // namespace tipgap
