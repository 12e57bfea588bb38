#pragma once
// How a delimited text file of curves or grids is read: which character separates the cells,
// which columns hold z and current (and x, y for grids), the units of header-less columns, the
// orientation of z, and the bias and temperature for files that do not state them. One struct
// for the curve reader (io/curve_io.hpp) and the grid readers (grid/grid.hpp).
//
// What every reader accepts without options: cells separated by commas, tabs, semicolons or runs
// of whitespace (detected from the header row, or from the first row of a header-less file); a
// decimal comma when the separator is not a comma; units in the header as `z [nm]`, `z (nm)` or
// `z/nm`; a UTF-8 byte-order mark; CRLF line ends; blank lines, `#` comment lines anywhere and
// empty cells after the last column (trailing delimiters).
#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "tipgap/core/enum_names.hpp"

namespace tipgap {

enum class delimiter_choice {
    detect,     // from the header row (tab, then semicolon, then comma, else whitespace)
    comma,      // ','
    tab,        // '\t'
    semicolon,  // ';'
    space,      // runs of spaces and tabs
};
// "detect", "comma", "tab", "semicolon", "space" (read in any letter case).
template <>
struct enum_names<delimiter_choice> {
    static constexpr bool ignore_case = true;
    static constexpr enum_name<delimiter_choice> table[] = {{delimiter_choice::detect, "detect"},
                                                            {delimiter_choice::comma, "comma"},
                                                            {delimiter_choice::tab, "tab"},
                                                            {delimiter_choice::semicolon, "semicolon"},
                                                            {delimiter_choice::space, "space"}};
};

struct reader_options {
    delimiter_choice delimiter = delimiter_choice::detect;
    // The columns of the roles, in role order: z, current for a curve; x, y, z, current for a
    // grid. Each is a header name (case-insensitive, compared without its unit) or a 1-based
    // column index ("3"). Empty: by the header names z and current (or I), x, y. Other columns
    // are read past. A file without a header row needs every role given by index, with units.
    std::vector<std::string> columns;
    // Units of the z, current and (grids) x and y columns, e.g. "nm", "pA": needed when the header
    // gives none (or there is no header); when the header gives another, this one is used and the
    // reader adds a note. Empty: from the header. Lengths m, cm, mm, um, nm, Å (A), pm; currents
    // A, mA, uA, nA, pA, fA.
    std::string z_unit;
    std::string current_unit;
    std::string xy_unit;
    // z grows as the tip approaches in this file: read z as -z, so that it grows as the tip
    // retracts (the direction every fit assumes).
    bool flip_z = false;
    // Bias (V, finite, 0 < |bias| <= 100) and temperature (K, [0, 2000]) for files that do not
    // state them (`# bias:`, `# temperature:`). A file that states another value is overridden,
    // and the reader adds a note saying so.
    std::optional<double> bias_V;
    std::optional<double> temperature_K;

    // Throws tipgap::error (input) naming the field (key "delimiter", "columns", "z_unit",
    // "current_unit", "xy_unit", "bias_V" or "temperature_K") for a bad value. roles: the number
    // of columns the reader needs (2 for a curve, 4 for a grid); `columns`, when given, must have
    // that many entries. A curve (roles 2) takes no xy_unit.
    void validate(std::size_t roles) const;
};

// The settings that differ from the defaults, each as (field key, value text) in field order,
// e.g. {"columns", "Z,I"}, {"flip_z", ""}, {"bias_V", "0.1V"}: what a report shows of how a file
// was read. Values are written so that the unit parser reads them back.
std::vector<std::pair<std::string, std::string>> settings(const reader_options& o);

// Reads reader options from a YAML file with the keys delimiter, columns (a list), z_unit,
// current_unit, xy_unit, flip_z (true/false), bias and temperature (values with units), all
// optional. Throws tipgap::error (input) at file:line:column for a bad key or value.
reader_options load_reader_options(const std::string& path);

}  // namespace tipgap
