// What precedes the data rows: byte-order mark, metadata, comments, then the header row or, in a
// header-less file, the first data row. See csv_header.hpp.
#include <fmt/format.h>

#include "io/detail/csv_header.hpp"

namespace tipgap::detail {

namespace {

constexpr std::string_view byte_order_mark = "\xEF\xBB\xBF";

// True when the first cell of `line` (in the detected dialect) is a number: a data row.
bool starts_with_number(std::string_view line, const column_choice& choice) {
    const csv_dialect d = choice.dialect ? *choice.dialect : detect_dialect(line, false);
    cell_cursor cells(line, d);
    std::string_view cell;
    int column = 0;
    double v = 0.0;
    return cells.next(cell, column) && parse_cell(cell, d, v) == number_status::ok;
}

// A file without a header row can be read when every role is chosen by index, with its unit.
bool headerless_allowed(const csv_format& format, const column_choice& choice) {
    if (choice.specs.empty()) return false;
    int index = 0;
    for (const std::string& s : choice.specs)
        if (!column_index(s, index)) return false;
    for (std::size_t k = 0; k < format.rules.size(); ++k) {
        const column_rule& r = format.rules[k];
        if (r.required && r.unit && (k >= choice.units.size() || choice.units[k].empty())) return false;
    }
    return true;
}

// The header of a header-less file: as many columns as its first data row has cells, the chosen
// ones named after their roles, the others "column N".
csv_header headerless_header(std::string_view first_row, int line_number, const std::string& file, const csv_format& format,
                             const column_choice& choice, csv_dialect d) {
    csv_header h;
    h.line = line_number - 1;
    h.present = false;
    const int n = count_filled_cells(first_row, d);
    for (int c = 0; c < n; ++c) h.columns.push_back(column_descriptor{"", fmt::format("column {}", c + 1), "", c + 1, -1, 1.0});
    std::size_t next = 0;
    for (std::size_t k = 0; k < format.rules.size() && next < choice.specs.size(); ++k) {
        const column_rule& rule = format.rules[k];
        if (!rule.required) continue;
        int index = 0;
        column_index(choice.specs[next++], index);
        const location where{file, line_number, 1, ""};
        if (index > n) {
            throw_input(where, fmt::format("column {} (chosen for {}) is beyond the {} cells of the first row (the file has "
                                           "no header)", index, rule.name, n));
        }
        column_descriptor& col = h.columns[index - 1];
        if (col.rule >= 0) throw_input(where, fmt::format("column {} is chosen for both {} and {}", index, format.rules[col.rule].name, rule.name));
        col.rule = static_cast<int>(k);
        col.name = std::string(rule.name);
        if (rule.unit) {
            col.unit = choice.units[k];
            col.scale = unit_factor(col.unit, *rule.unit, col.unit, where);
        }
    }
    return h;
}

}  // namespace

csv_preamble read_preamble(std::string_view text, bool whole_file, const std::string& file, const csv_format& format,
                           const column_choice& choice) {
    const std::size_t start = text.starts_with(byte_order_mark) ? byte_order_mark.size() : 0;
    if (text.find_first_not_of(" \t\r\n", start) == std::string_view::npos) {
        throw_input(location{file, 0, 0, ""},
                    fmt::format("the file is empty; expected a header row such as {} followed by data rows",
                                format.header_example));
    }
    csv_preamble out;
    line_cursor lines(text.substr(start));
    std::string_view line;
    std::size_t line_start = start;
    // The '#' lines, read once the dialect is known (a decimal comma applies to them too).
    std::vector<std::pair<std::string_view, int>> comments;
    while (lines.next(line)) {
        if (!whole_file && !lines.ended_by_newline()) {
            throw_input(location{file, lines.line_number(), 0, ""},
                        fmt::format("no header within the first {} bytes; expected a header such as {}", text.size(),
                                    format.header_example));
        }
        const std::string_view t = trim_cell(line);
        if (t.empty() || t.front() == '#') {
            if (!t.empty()) comments.emplace_back(line, lines.line_number());
            line_start = start + lines.offset();
            continue;
        }
        const bool headerless = headerless_allowed(format, choice) && starts_with_number(line, choice);
        out.dialect = choice.dialect ? *choice.dialect : detect_dialect(line, headerless);
        for (const auto& [c, n] : comments) parse_metadata_line(c, n, file, out.metadata, out.dialect.decimal_comma);
        if (headerless) {
            out.header = headerless_header(line, lines.line_number(), file, format, choice, out.dialect);
            out.data_offset = line_start;
        } else {
            out.header = parse_header_row(line, lines.line_number(), file, format, choice, out.dialect);
            out.data_offset = start + lines.offset();
        }
        return out;
    }
    for (const auto& [c, n] : comments) parse_metadata_line(c, n, file, out.metadata);
    throw_input(location{file, 0, 0, ""},
                fmt::format("no header row: the file holds only '#' lines; expected a header such as {} followed by "
                            "data rows",
                            format.header_example));
}

}  // namespace tipgap::detail
