// The header-row and metadata reader shared by the curve and grid readers; see csv_header.hpp.
#include "io/detail/csv_header.hpp"

#include <cctype>
#include <fmt/format.h>

#include "io/detail/csv_scan.hpp"

namespace tipgap::detail {

bool iequals(std::string_view a, std::string_view b) {
    if (a.size() != b.size()) return false;
    for (std::size_t i = 0; i < a.size(); ++i) {
        if (std::tolower(static_cast<unsigned char>(a[i])) != std::tolower(static_cast<unsigned char>(b[i])))
            return false;
    }
    return true;
}

void split_header_cell(std::string_view cell, std::string_view& name, std::string_view& unit, bool& has_brackets) {
    std::size_t open = cell.find('[');
    std::size_t close = cell.rfind(']');
    has_brackets = open != std::string_view::npos && close != std::string_view::npos && close > open;
    if (!has_brackets) {
        name = trim_cell(cell);
        unit = {};
        return;
    }
    name = trim_cell(cell.substr(0, open));
    unit = trim_cell(cell.substr(open + 1, close - open - 1));
}

double unit_factor(std::string_view unit, dimension d, std::string_view cell, const location& where) {
    try {
        return parse_quantity(fmt::format("1 {}", unit), d, where);
    } catch (const error&) {
        throw_input(where, fmt::format("unknown unit {} in {}; expected {} in {}", quote_input(unit, 20), quote_input(cell), dimension_phrase(d),
                                       accepted_units(d)));
    }
}

void parse_metadata_line(std::string_view line, int line_number, const std::string& file, curve_metadata& meta) {
    std::string_view body = trim_cell(line.substr(line.find('#') + 1));
    std::size_t colon = body.find(':');
    if (colon == std::string_view::npos) return;  // a plain comment
    std::string_view key = trim_cell(body.substr(0, colon));
    std::string_view value = trim_cell(body.substr(colon + 1));
    if (key.empty()) return;
    meta.entries.emplace_back(std::string(key), std::string(value));
    // Column of the value, for messages about a bad value of a known key.
    int value_column = static_cast<int>(value.data() - line.data()) + 1;
    location where{file, line_number, value_column, std::string(key)};
    if (key == "bias") {
        meta.bias_V = parse_quantity(value, dimension::voltage, where);
    } else if (key == "temperature") {
        meta.temperature_K = parse_quantity(value, dimension::temperature, where);
    } else if (key == "setpoint_current") {
        meta.setpoint_current_A = parse_quantity(value, dimension::current, where);
    } else if (key == "x") {
        meta.x_m = parse_quantity(value, dimension::length, where);
    } else if (key == "y") {
        meta.y_m = parse_quantity(value, dimension::length, where);
    } else if (key == "sample") {
        meta.sample = std::string(value);
    } else if (key == "tip") {
        meta.tip = std::string(value);
    }
}

int csv_header::find(int rule) const {
    for (std::size_t c = 0; c < columns.size(); ++c) {
        if (columns[c].rule == rule) return static_cast<int>(c);
    }
    return -1;
}

namespace {

// The descriptor of one header cell: its name and unit, and for a known column its rule and the
// SI scale of its unit.
column_descriptor describe_cell(std::string_view cell, const location& where, const csv_format& format) {
    std::string_view name, unit;
    bool brackets = false;
    split_header_cell(cell, name, unit, brackets);
    column_descriptor d;
    d.name = std::string(name);
    d.unit = std::string(unit);
    d.column = where.column;
    for (std::size_t k = 0; k < format.rules.size(); ++k) {
        if (!iequals(name, format.rules[k].name)) continue;
        const column_rule& rule = format.rules[k];
        d.rule = static_cast<int>(k);
        if (!rule.unit) break;
        if (!brackets || unit.empty()) {
            throw_input(where, fmt::format("column '{}' has no unit; write it in brackets, e.g. '{}'", name, rule.unit_example));
        }
        d.scale = unit_factor(unit, *rule.unit, cell, where);
        break;
    }
    return d;
}

}  // namespace

csv_header parse_header_row(std::string_view line, int line_number, const std::string& file, const csv_format& format) {
    csv_header header;
    header.line = line_number;
    cell_cursor cells(line);
    std::string_view cell;
    int column = 0;
    while (cells.next(cell, column)) {
        const location where{file, line_number, column, ""};
        double probe = 0.0;
        if (header.columns.empty() && parse_double(cell, probe) == number_status::ok) {
            throw_input(where, fmt::format("no header row: the first row holds numbers; expected a header such as {} "
                                           "before the data",
                                           format.header_example));
        }
        column_descriptor d = describe_cell(cell, where, format);
        if (d.rule >= 0 && header.find(d.rule) >= 0) {
            throw_input(where, fmt::format("column '{}' appears twice in the header", d.name));
        }
        header.columns.push_back(std::move(d));
    }
    for (std::size_t k = 0; k < format.rules.size(); ++k) {
        const column_rule& rule = format.rules[k];
        if (!rule.required || header.find(static_cast<int>(k)) >= 0) continue;
        const std::string missing =
            rule.unit ? fmt::format("{} [<{} unit>]", rule.name, dimension_name(*rule.unit)) : std::string(rule.name);
        throw_input(location{file, line_number, 1, ""},
                    fmt::format("the header has no '{}' column; expected a header such as {}", missing,
                                format.header_example));
    }
    return header;
}

csv_preamble read_preamble(std::string_view text, bool whole_file, const std::string& file, const csv_format& format) {
    if (text.find_first_not_of(" \t\r\n") == std::string_view::npos) {
        throw_input(location{file, 0, 0, ""},
                    fmt::format("the file is empty; expected a header row such as {} followed by data rows",
                                format.header_example));
    }
    csv_preamble out;
    line_cursor lines(text);
    std::string_view line;
    while (lines.next(line)) {
        if (!whole_file && !lines.ended_by_newline()) {
            throw_input(location{file, lines.line_number(), 0, ""},
                        fmt::format("no header within the first {} bytes; expected a header such as {}", text.size(),
                                    format.header_example));
        }
        const std::string_view t = trim_cell(line);
        if (t.empty()) continue;
        if (t.front() == '#') {
            parse_metadata_line(line, lines.line_number(), file, out.metadata);
            continue;
        }
        out.header = parse_header_row(line, lines.line_number(), file, format);
        out.data_offset = lines.offset();
        return out;
    }
    throw_input(location{file, 0, 0, ""},
                fmt::format("no header row: the file holds only '#' lines; expected a header such as {} followed by "
                            "data rows",
                            format.header_example));
}

}  // namespace tipgap::detail
