// The reader options of curves and grids: names, checks and the settings a report shows; see
// tipgap/io/reader_options.hpp.
#include "tipgap/io/reader_options.hpp"

#include <cmath>
#include <fmt/format.h>

#include "io/detail/csv_header.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap {

namespace {

// Role names of the `columns` entries, for messages.
const char* role_list(std::size_t roles) { return roles == 4 ? "x, y, z, current" : "z, current"; }

void check_columns(const std::vector<std::string>& columns, std::size_t roles) {
    const location where{"", 0, 0, "columns"};
    if (columns.empty()) return;
    if (columns.size() != roles) {
        throw_input(where, fmt::format("{} column{} given; expected {} ({}), each a header name or a 1-based index",
                                       columns.size(), columns.size() == 1 ? "" : "s", roles, role_list(roles)));
    }
    for (std::size_t k = 0; k < columns.size(); ++k) {
        const std::string_view spec = detail::trim_cell(columns[k]);
        if (spec.empty()) throw_input(where, fmt::format("entry {} is empty; expected a header name or a 1-based index", k + 1));
        int index = 0;
        if (detail::column_index(spec, index) && index < 1) {
            throw_input(where, fmt::format("{} is not a column index; expected 1 or more (indices are 1-based)", quote_input(spec)));
        }
        for (std::size_t j = 0; j < k; ++j) {
            if (detail::same_column_spec(columns[j], spec))
                throw_input(where, fmt::format("{} is given twice; expected one column per role ({})", quote_input(spec), role_list(roles)));
        }
    }
}

void check_unit(const std::string& unit, dimension d, const char* key) {
    if (unit.empty()) return;
    try {
        (void)parse_quantity(fmt::format("1 {}", unit), d);
    } catch (const error&) {
        throw_input(location{"", 0, 0, key}, fmt::format("unknown unit {}; expected {} in {}", quote_input(unit, 20),
                                                         dimension_phrase(d), accepted_units(d)));
    }
}

}  // namespace

void reader_options::validate(std::size_t roles) const {
    check_columns(columns, roles);
    check_unit(z_unit, dimension::length, "z_unit");
    check_unit(current_unit, dimension::current, "current_unit");
    if (roles < 4 && !xy_unit.empty())
        throw_input(location{"", 0, 0, "xy_unit"}, "a curve has no x and y columns; expected no x, y unit");
    check_unit(xy_unit, dimension::length, "xy_unit");
    // A bias of 0 gives no tunnelling current; 100 V is the largest bias limit a config may set.
    if (bias_V && !(std::isfinite(*bias_V) && *bias_V != 0.0 && std::abs(*bias_V) <= 100.0)) {
        throw_input(location{"", 0, 0, "bias_V"}, fmt::format("{:g} V is out of range; expected a bias with 0 < |bias| <= 100 V", *bias_V));
    }
    // The model's temperature range (model_options::validate).
    if (temperature_K && !(std::isfinite(*temperature_K) && *temperature_K >= 0.0 && *temperature_K <= 2000.0)) {
        throw_input(location{"", 0, 0, "temperature_K"},
                    fmt::format("{:g} K is out of range; expected a temperature in [0, 2000] K", *temperature_K));
    }
}

std::vector<std::pair<std::string, std::string>> settings(const reader_options& o) {
    std::vector<std::pair<std::string, std::string>> out;
    if (o.delimiter != delimiter_choice::detect) out.emplace_back("delimiter", to_string(o.delimiter));
    if (!o.columns.empty()) out.emplace_back("columns", fmt::format("{}", fmt::join(o.columns, ",")));
    if (!o.z_unit.empty()) out.emplace_back("z_unit", o.z_unit);
    if (!o.current_unit.empty()) out.emplace_back("current_unit", o.current_unit);
    if (!o.xy_unit.empty()) out.emplace_back("xy_unit", o.xy_unit);
    if (o.flip_z) out.emplace_back("flip_z", "");
    if (o.bias_V) out.emplace_back("bias_V", fmt::format("{:g}V", *o.bias_V));
    if (o.temperature_K) out.emplace_back("temperature_K", fmt::format("{:g}K", *o.temperature_K));
    return out;
}

}  // namespace tipgap
