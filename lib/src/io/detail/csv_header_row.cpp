// The header row: its cells as column descriptors, which column plays which role (by the rules'
// names or by the reader options' column choice), and the SI scale of each unit. See
// csv_header.hpp.
#include <cmath>
#include <fmt/format.h>

#include "io/detail/csv_header.hpp"

namespace tipgap::detail {

namespace {

// The cells of a header row with their columns. In a whitespace-separated header a unit written
// apart ("z [nm]", "z (nm)") belongs to the name before it; empty cells after the last name
// (trailing delimiters) are dropped.
std::vector<column_descriptor> header_cells(std::string_view line, csv_dialect d) {
    std::vector<column_descriptor> out;
    cell_cursor cells(line, d);
    std::string_view cell;
    int column = 0, open = 0;  // open: brackets not yet closed in the last cell
    while (cells.next(cell, column)) {
        const bool joins = d.runs() && !out.empty() && (open > 0 || cell.front() == '[' || cell.front() == '(');
        if (joins) {
            out.back().text.append(1, ' ').append(cell);
        } else {
            out.push_back(column_descriptor{std::string(cell), "", "", column, -1, 1.0});
            open = 0;
        }
        for (char c : cell) open += (c == '[' || c == '(') - (c == ']' || c == ')');
    }
    while (!out.empty() && out.back().text.empty()) out.pop_back();
    // Split "name [unit]" now that each cell is whole.
    for (column_descriptor& c : out) {
        std::string_view name, unit;
        bool has_unit = false;
        split_header_cell(c.text, name, unit, has_unit);
        c.name = std::string(name);
        c.unit = std::string(unit);
    }
    return out;
}

// The header's names for a message: the first few, each clipped, so that the line stays short.
std::string name_list(const std::vector<column_descriptor>& columns) {
    constexpr std::size_t shown = 8;
    std::string out;
    for (std::size_t c = 0; c < columns.size() && c < shown; ++c)
        out += fmt::format("{}{}", c == 0 ? "" : ", ", quote_input(columns[c].name, 30));
    if (columns.size() > shown) out += fmt::format(", ... ({} columns)", columns.size());
    return out;
}

// The column a spec names: a 1-based index or a header name (without its unit).
int resolve_spec(std::string_view spec, const std::vector<column_descriptor>& columns, const column_rule& rule,
                 const location& where) {
    int index = 0;
    if (column_index(spec, index)) {
        if (index < 1 || index > static_cast<int>(columns.size()))
            throw_input(where, fmt::format("column {} (chosen for {}) is beyond the {} columns of the header", index, rule.name,
                                           columns.size()));
        return index - 1;
    }
    std::string_view name, unit;
    bool has_unit = false;
    split_header_cell(spec, name, unit, has_unit);
    for (std::size_t c = 0; c < columns.size(); ++c)
        if (iequals(columns[c].name, name)) return static_cast<int>(c);
    throw_input(where, fmt::format("no column named {} (chosen for {}); the header has {}", quote_input(name, 30), rule.name,
                                   name_list(columns)));
}

// Roles by the choice: the required rules' columns in rule order.
void assign_by_choice(std::vector<column_descriptor>& columns, const csv_format& format, const column_choice& choice,
                      const location& header_line) {
    std::size_t next = 0;
    for (std::size_t k = 0; k < format.rules.size() && next < choice.specs.size(); ++k) {
        if (!format.rules[k].required) continue;
        const int c = resolve_spec(choice.specs[next++], columns, format.rules[k], header_line);
        if (columns[c].rule >= 0) {
            throw_input(header_line, fmt::format("column {} is chosen for both {} and {}", quote_input(columns[c].name, 30),
                                                 format.rules[columns[c].rule].name, format.rules[k].name));
        }
        columns[c].rule = static_cast<int>(k);
    }
}

// Roles by name: each rule's name or alias (rules the choice has not placed).
void assign_by_names(std::vector<column_descriptor>& columns, const csv_format& format, const column_choice& choice,
                     const std::string& file, int line_number) {
    for (column_descriptor& d : columns) {
        if (d.rule >= 0) continue;
        for (std::size_t k = 0; k < format.rules.size(); ++k) {
            const column_rule& rule = format.rules[k];
            if (!choice.specs.empty() && rule.required) continue;
            if (!iequals(d.name, rule.name) && (rule.alias.empty() || !iequals(d.name, rule.alias))) continue;
            for (const column_descriptor& other : columns) {
                if (other.rule == static_cast<int>(k))
                    throw_input(location{file, line_number, d.column, ""}, fmt::format("column {} appears twice in the header", quote_input(d.name, 30)));
            }
            d.rule = static_cast<int>(k);
            break;
        }
    }
}

// The SI scale of each placed column's unit: the given unit, else the header's. A given unit
// that differs from the header's (or replaces one tipgap does not know) wins, with a note.
void set_scales(std::vector<column_descriptor>& columns, const csv_format& format, const column_choice& choice,
                const std::string& file, int line_number, std::vector<std::string>& notes) {
    for (column_descriptor& d : columns) {
        if (d.rule < 0 || !format.rules[d.rule].unit) continue;
        const column_rule& rule = format.rules[d.rule];
        const dimension dim = *rule.unit;
        const location where{file, line_number, d.column, ""};
        const std::string given = d.rule < static_cast<int>(choice.units.size()) ? choice.units[d.rule] : "";
        if (given.empty()) {
            if (d.unit.empty())
                throw_input(where, fmt::format("column {} has no unit; write it in brackets, e.g. '{}'", quote_input(d.name, 30), rule.unit_example));
            d.scale = unit_factor(d.unit, dim, d.text, where);
            continue;
        }
        d.scale = unit_factor(given, dim, given, where);  // checked by reader_options::validate
        double header_scale = 0.0;
        try {
            header_scale = d.unit.empty() ? d.scale : unit_factor(d.unit, dim, d.text, where);
        } catch (const error&) {
        }
        if (header_scale != d.scale) {
            notes.push_back(fmt::format("column {}: the header gives the unit {}; the given unit '{}' is used instead",
                                        quote_input(d.name, 30), quote_input(d.unit, 20), given));
        }
        d.unit = given;
    }
}

void require_rules(const csv_header& header, const csv_format& format, const std::string& file, int line_number) {
    for (std::size_t k = 0; k < format.rules.size(); ++k) {
        const column_rule& rule = format.rules[k];
        if (!rule.required || header.find(static_cast<int>(k)) >= 0) continue;
        const std::string missing =
            rule.unit ? fmt::format("{} [<{} unit>]", rule.name, dimension_name(*rule.unit)) : std::string(rule.name);
        throw_input(location{file, line_number, 1, ""},
                    fmt::format("the header has no '{}' column; expected a header such as {}", missing, format.header_example));
    }
}

}  // namespace

csv_header parse_header_row(std::string_view line, int line_number, const std::string& file, const csv_format& format,
                            const column_choice& choice, csv_dialect d) {
    csv_header header;
    header.line = line_number;
    header.columns = header_cells(line, d);
    double probe = 0.0;
    if (!header.columns.empty() && parse_double(header.columns.front().name, probe) == number_status::ok) {
        throw_input(location{file, line_number, header.columns.front().column, ""},
                    fmt::format("no header row: the first row holds numbers; expected a header such as {} before the data "
                                "(or, for a file without a header, the columns by index with their units: {})",
                                format.header_example, format.headerless_example));
    }
    assign_by_choice(header.columns, format, choice, location{file, line_number, 1, ""});
    assign_by_names(header.columns, format, choice, file, line_number);
    set_scales(header.columns, format, choice, file, line_number, header.notes);
    require_rules(header, format, file, line_number);
    return header;
}

}  // namespace tipgap::detail
