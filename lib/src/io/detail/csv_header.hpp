#pragma once
// The one reader of what comes before the data rows of a CSV file, shared by the curve reader
// (io/curve_io.cpp) and the grid readers (grid/grid_csv.cpp, and grid/grid_dir.cpp through the
// curve reader): "# key: value" metadata lines, comments and blank lines, then the header row of
// "name [unit]" cells. Each reader says which columns it knows (a column_rule table); the header
// comes back as one column_descriptor per cell, with the SI scale of its unit, so that a reader
// only maps descriptors to its own roles. Messages are the same for every reader.
//
// The seams for other dialects: how a cell splits into name and unit (split_header_cell), how a
// line splits into cells (cell_cursor in csv_scan.hpp) and how a rule matches a name
// (parse_header_row) are each written once, here.
#include <cstddef>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"
#include "tipgap/io/curve_io.hpp"

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

// A column a reader knows.
struct column_rule {
    std::string_view name;              // matched case-insensitively against the cell's name
    std::optional<dimension> unit;      // the dimension of its required unit; none: no unit read
    std::string_view unit_example;      // "z [nm]", for the message about a missing unit
    bool required = true;               // a header without it is an error
};

// What a reader expects before its data rows.
struct csv_format {
    std::span<const column_rule> rules;
    std::string_view header_example;    // "'z [nm],current [nA]'", quoted, for messages
};

// One cell of the header row.
struct column_descriptor {
    std::string name;                   // as written, trimmed, without the unit
    std::string unit;                   // as written between the brackets; empty without
    int column = 0;                     // 1-based character column of the cell
    int rule = -1;                      // index of the matching column_rule; -1: read past
    double scale = 1.0;                 // SI value of one file unit (1 without a unit)
};

struct csv_header {
    std::vector<column_descriptor> columns;
    int line = 0;                       // 1-based line of the header row

    // The column that matched rule k, or -1.
    int find(int rule) const;
};

// Parses the header row `line` (line `line_number` of `file`). Throws tipgap::error (input) at
// file:line:column when the first cell is a number (no header), a column with a unit rule has no
// or an unknown unit, a known column appears twice, or a required column is missing.
csv_header parse_header_row(std::string_view line, int line_number, const std::string& file, const csv_format& format);

// Everything before the data rows.
struct csv_preamble {
    curve_metadata metadata;            // the "# key: value" lines
    csv_header header;
    std::size_t data_offset = 0;        // byte offset in the text of the line after the header
};

// Reads metadata, comments and blank lines up to the header row of `text`. whole_file: the text
// is the whole file; otherwise it is the file's first chunk, which must hold the header's line
// end. Throws tipgap::error (input) for an empty file, a file without a header row, a header not
// within the chunk, a bad metadata value or a bad header (parse_header_row).
csv_preamble read_preamble(std::string_view text, bool whole_file, const std::string& file, const csv_format& format);

}  // namespace tipgap::detail
