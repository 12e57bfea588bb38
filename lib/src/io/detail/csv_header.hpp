#pragma once
// Header-row and metadata helpers shared by the curve reader and the grid reader, so that both
// accept the same "# key: value" lines and "name [unit]" columns with the same messages.
#include <string>
#include <string_view>

#include "tipgap/io/curve_io.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap::detail {

// Case-insensitive ASCII comparison.
bool iequals(std::string_view a, std::string_view b);

// Splits "name [unit]" into its parts; `unit` is empty (and has_brackets false) without brackets.
void split_header_cell(std::string_view cell, std::string_view& name, std::string_view& unit, bool& has_brackets);

// SI value of one `unit` of dimension d; throws naming `cell` and the accepted units.
double unit_factor(std::string_view unit, dimension d, std::string_view cell, const location& where);

// Reads one '#' line into `meta` when it has the form "# key: value" (other comments are ignored).
// Known keys (bias, temperature, setpoint_current, x, y, sample, tip) are parsed; a bad value
// throws naming file:line:column of the value.
void parse_metadata_line(std::string_view line, int line_number, const std::string& file, curve_metadata& meta);

}  // namespace tipgap::detail
