#pragma once
// The one reader of what comes before the data rows of a delimited file, shared by the curve
// reader (io/curve_io.cpp) and the grid readers (grid/grid_csv.cpp, and grid/grid_dir.cpp through
// the curve reader): a byte-order mark, "# key: value" metadata lines, comments and blank lines,
// then the header row of "name [unit]" cells (or, in a header-less file, the first data row). It
// decides the dialect (csv_scan.hpp) and which column plays which role. Each reader says which
// columns it knows (a column_rule table); the header comes back as one column_descriptor per
// cell, with the SI scale of its unit, so that a reader only maps descriptors to its own roles.
// Messages are the same for every reader.
#include <cstddef>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "io/detail/csv_scan.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/io/reader_options.hpp"

namespace tipgap::detail {

// Case-insensitive ASCII comparison.
bool iequals(std::string_view a, std::string_view b);

// Splits a header cell into name and unit: "name [unit]", "name (unit)" or "name/unit"; `unit`
// is empty (and has_unit false) without one.
void split_header_cell(std::string_view cell, std::string_view& name, std::string_view& unit, bool& has_unit);

// SI value of one `unit` of dimension d; throws naming `cell` and the accepted units.
double unit_factor(std::string_view unit, dimension d, std::string_view cell, const location& where);

// A column spec that is a 1-based index ("3"): true with `index` set; false for a name.
bool column_index(std::string_view spec, int& index);
// Two column specs that name the same column: equal indices, or equal names (case-insensitive,
// compared without their units).
bool same_column_spec(std::string_view a, std::string_view b);

// Reads one '#' line into `meta` when it has the form "# key: value" (other comments are ignored).
// Known keys (bias, temperature, setpoint_current, x, y, sample, tip) are parsed; a bad value
// throws naming file:line:column of the value. decimal_comma: a number with one comma and no
// point reads the comma as the decimal mark ("0,1 V").
void parse_metadata_line(std::string_view line, int line_number, const std::string& file, curve_metadata& meta,
                         bool decimal_comma = false);

// Sets the bias and temperature of `o` in `meta` when given; adds a note to `notes` for each
// value the file states differently.
void apply_overrides(const reader_options& o, curve_metadata& meta, std::vector<std::string>& notes);

// A column a reader knows.
struct column_rule {
    std::string_view name;              // matched case-insensitively against the cell's name
    std::string_view alias;             // a second accepted name ("I" for current), or ""
    std::optional<dimension> unit;      // the dimension of its required unit; none: no unit read
    std::string_view unit_example;      // "z [nm]", for the message about a missing unit
    bool required = true;               // a header without it is an error
};

// What a reader expects before its data rows.
struct csv_format {
    std::span<const column_rule> rules;
    std::string_view header_example;      // "'z [nm],current [nA]'", quoted, for messages
    std::string_view headerless_example;  // "--columns 1,2 --z-unit nm --current-unit pA"
};

// What the reader options ask of the header.
struct column_choice {
    std::vector<std::string> specs;           // the required rules' columns, in rule order, or empty
    std::vector<std::string> units;           // per rule: the unit given for it, or "" (from the header)
    std::optional<csv_dialect> dialect;       // forced, or detected from the file
};

// The choice of `o` for a reader whose rules take the units `units` (one per rule, in rule order).
column_choice choice_of(const reader_options& o, std::vector<std::string> units);

// One cell of the header row.
struct column_descriptor {
    std::string text;                   // the cell as written, trimmed
    std::string name;                   // as written, trimmed, without the unit
    std::string unit;                   // as written in the header; empty without
    int column = 0;                     // 1-based character column of the cell
    int rule = -1;                      // index of the matching column_rule; -1: read past
    double scale = 1.0;                 // SI value of one file unit (1 without a unit)
};

struct csv_header {
    std::vector<column_descriptor> columns;
    int line = 0;                       // 1-based line of the header row; for a header-less file
                                        // the line before the first data row
    bool present = true;                // false: a header-less file
    std::vector<std::string> notes;     // units given that differ from the header's

    // The column that matched rule k, or -1.
    int find(int rule) const;
    // "the header on line 3" or "the first row (line 3)", for messages about cell counts.
    std::string describe() const;
};

// Parses the header row `line` (line `line_number` of `file`) in dialect `d`. Throws
// tipgap::error (input) at file:line:column when the first cell is a number (no header), a
// chosen column is not in the header, a column with a unit rule has no or an unknown unit, a
// known column appears twice, or a required column is missing.
csv_header parse_header_row(std::string_view line, int line_number, const std::string& file, const csv_format& format,
                            const column_choice& choice, csv_dialect d);

// Everything before the data rows.
struct csv_preamble {
    curve_metadata metadata;            // the "# key: value" lines
    csv_header header;
    csv_dialect dialect;
    std::size_t data_offset = 0;        // byte offset in the text of the first line after the header
};

// Reads a byte-order mark, metadata, comments and blank lines up to the header row of `text` (or
// the first data row of a header-less file, which `choice` must allow: every column by index,
// every unit given). whole_file: the text is the whole file; otherwise it is the file's first
// chunk, which must hold the header's line end. Throws tipgap::error (input) for an empty file, a
// file without a header row, a header not within the chunk, a bad metadata value or a bad header
// (parse_header_row).
csv_preamble read_preamble(std::string_view text, bool whole_file, const std::string& file, const csv_format& format,
                           const column_choice& choice);

}  // namespace tipgap::detail
