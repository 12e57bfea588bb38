// Bias-sweep traces z(V) / dI/dV(V), read with the curve reader's CSV and header helpers.
#include "tipgap/io/trace_io.hpp"

#include "io/detail/read_capped.hpp"

#include <algorithm>
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <iterator>
#include <numeric>

#include "io/detail/csv_header.hpp"
#include "io/detail/csv_scan.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap {
namespace {

constexpr std::size_t min_trace_points = 8;
constexpr const char* header_example = "'bias [V],z [nm]' or 'bias [V],didv [nS]'";

struct trace_columns {
    int bias = -1, signal = -1, count = 0;
    double bias_factor = 1.0, signal_factor = 1.0;
};

bool is_didv(std::string_view name) {
    using detail::iequals;
    return iequals(name, "didv") || iequals(name, "dIdV") || iequals(name, "dI/dV");
}

// One header cell: records the bias or signal column it names.
void header_cell(std::string_view cell, const location& where, bias_trace& t, trace_columns& cols) {
    std::string_view name, unit;
    bool brackets = false;
    detail::split_header_cell(cell, name, unit, brackets);
    const bool bias = detail::iequals(name, "bias"), z = detail::iequals(name, "z"), didv = is_didv(name);
    if (!bias && !z && !didv) return;
    if (!brackets || unit.empty()) {
        throw_input(where, fmt::format("column '{}' has no unit; write it in brackets, e.g. '{}'", name,
                                       bias ? "bias [V]" : z ? "z [nm]" : "didv [nS]"));
    }
    int& slot = bias ? cols.bias : cols.signal;
    if (slot >= 0) throw_input(where, fmt::format("the header has two {} columns", bias ? "bias" : "z/didv"));
    slot = cols.count;
    if (bias) {
        cols.bias_factor = detail::unit_factor(unit, dimension::voltage, cell, where);
    } else if (z) {
        t.kind = trace_kind::zv;
        cols.signal_factor = detail::unit_factor(unit, dimension::length, cell, where);
    } else {
        t.kind = trace_kind::didv;
        t.arbitrary_units = detail::iequals(unit, "a.u.");
        cols.signal_factor = t.arbitrary_units ? 1.0 : detail::unit_factor(unit, dimension::conductance, cell, where);
    }
}

// A "# current: 1 nA" line (the key the traces carry; `setpoint_current` is parsed by the
// shared metadata reader).
void current_line(std::string_view line, int number, const std::string& file, bias_trace& t) {
    const auto& [key, value] = t.metadata.entries.back();
    if (key != "current") return;
    const std::size_t at = line.find(value);
    location where{file, number, at == std::string_view::npos ? 0 : static_cast<int>(at) + 1, "current"};
    t.current_A = parse_quantity(value, dimension::current, where);
}

trace_columns read_header(detail::line_cursor& lines, const std::string& file, bias_trace& t) {
    std::string_view line;
    while (lines.next(line)) {
        std::string_view s = detail::trim_cell(line);
        if (s.empty()) continue;
        if (s.front() == '#') {
            const std::size_t before = t.metadata.entries.size();
            detail::parse_metadata_line(line, lines.line_number(), file, t.metadata);
            if (t.metadata.entries.size() > before) current_line(line, lines.line_number(), file, t);
            continue;
        }
        trace_columns cols;
        detail::cell_cursor cells(line);
        std::string_view cell;
        int column = 0;
        for (; cells.next(cell, column); ++cols.count) {
            location where{file, lines.line_number(), column, ""};
            double probe = 0.0;
            if (cols.count == 0 && detail::parse_double(cell, probe) == detail::number_status::ok) {
                throw_input(where, fmt::format("no header row: the first row holds numbers; expected a header such "
                                               "as {} before the data", header_example));
            }
            header_cell(cell, where, t, cols);
        }
        if (cols.bias < 0 || cols.signal < 0) {
            throw_input(location{file, lines.line_number(), 1, ""},
                        fmt::format("the header has no '{}' column; expected a header such as {}",
                                    cols.bias < 0 ? "bias [<voltage unit>]" : "z [<length unit>]' or 'didv",
                                    header_example));
        }
        return cols;
    }
    throw_input(location{file, 0, 0, ""},
                fmt::format("no header row; expected a header such as {} followed by data rows", header_example));
}

double cell_value(std::string_view cell, const location& where, std::string_view column_name) {
    double v = 0.0;
    if (detail::parse_double(cell, v) != detail::number_status::ok) {
        throw_input(where, fmt::format("{} in column '{}' is not a finite number; expected a plain number such as "
                                       "0.25 (the unit goes in the header)",
                                       quote_input(cell), column_name));
    }
    return v;
}

void read_rows(detail::line_cursor& lines, const std::string& file, const trace_columns& cols, bias_trace& t) {
    std::string_view line;
    while (lines.next(line)) {
        std::string_view s = detail::trim_cell(line);
        if (s.empty() || s.front() == '#') continue;
        const int n = detail::count_cells(line);
        if (n != cols.count) {
            throw_input(location{file, lines.line_number(), 1, ""},
                        fmt::format("the row has {} cell{}; the header has {} columns", n, n == 1 ? "" : "s",
                                    cols.count));
        }
        detail::cell_cursor cells(line);
        std::string_view cell;
        int column = 0;
        double bias = 0.0, signal = 0.0;
        for (int c = 0; cells.next(cell, column); ++c) {
            location where{file, lines.line_number(), column, ""};
            if (c == cols.bias) bias = cell_value(cell, where, "bias") * cols.bias_factor;
            if (c == cols.signal) signal = cell_value(cell, where, t.kind == trace_kind::zv ? "z" : "didv") * cols.signal_factor;
        }
        t.bias_V.push_back(bias);
        t.signal.push_back(signal);
    }
}

void sort_by_bias(bias_trace& t) {
    std::vector<std::size_t> order(t.bias_V.size());
    std::iota(order.begin(), order.end(), 0);
    std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return t.bias_V[a] < t.bias_V[b]; });
    std::vector<double> v(order.size()), s(order.size());
    for (std::size_t i = 0; i < order.size(); ++i) {
        v[i] = t.bias_V[order[i]];
        s[i] = t.signal[order[i]];
        if (i > 0 && v[i] == v[i - 1]) {
            throw_input(location{t.file, 0, 0, "bias"},
                        fmt::format("bias {:g} V appears twice; expected one row per bias", v[i]));
        }
    }
    t.bias_V.swap(v);
    t.signal.swap(s);
}

}  // namespace

const char* to_string(trace_kind k) { return k == trace_kind::zv ? "z(V)" : "dI/dV(V)"; }

bias_trace parse_bias_trace(std::string_view text, const std::string& file) {
    bias_trace t;
    t.file = file;
    if (text.find_first_not_of(" \t\r\n") == std::string_view::npos) {
        throw_input(location{file, 0, 0, ""},
                    fmt::format("the file is empty; expected a header row such as {} followed by data rows",
                                header_example));
    }
    detail::line_cursor lines(text);
    const trace_columns cols = read_header(lines, file, t);
    read_rows(lines, file, cols, t);
    if (t.bias_V.size() < min_trace_points) {
        throw_input(location{file, 0, 0, ""}, fmt::format("only {} data row{}; a trace needs at least {} points",
                                                          t.bias_V.size(), t.bias_V.size() == 1 ? "" : "s",
                                                          min_trace_points));
    }
    if (!t.current_A) t.current_A = t.metadata.setpoint_current_A;
    sort_by_bias(t);
    return t;
}

bias_trace read_bias_trace(const std::string& path) {
    const std::string text = detail::read_capped(path, detail::stream_cap_bytes, true, "a trace file (CSV)");
    return parse_bias_trace(text, path);
}

}  // namespace tipgap
