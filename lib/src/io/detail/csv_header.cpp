// Header-row and metadata helpers shared by the curve and grid readers.
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

}  // namespace tipgap::detail
