#pragma once
// The fast path of the grid CSV parser (grid_csv.cpp) for the common layout: comma-delimited
// rows "x,y,z,current" with LF line ends, no spaces, no comments, in the default column order.
// One row is taken in a single pass without the general parser's per-cell role dispatch, padding
// and delimiter checks. Anything else (a space, a tab, a CR, a '#', an empty cell, a decimal
// comma, a cell that scan_number cannot read, another cell count) makes it return nullptr, and
// the general parser reads that row; where it accepts a row it gives the same texts and the same
// doubles bit for bit (both use scan_number; tests/grid/fast_rows_test.cpp checks it on varied
// files).
#include <atomic>
#include <string_view>

#include "io/detail/csv_scan.hpp"

namespace tipgap::detail {

// The cells of one plain row: x and y as text (the general parser compares them with the previous
// row's and parses them only when they change), z and current as doubles in the file's units.
struct plain_row {
    std::string_view x_text, y_text;
    double z = 0.0, current = 0.0;
};

// Off only in tests that compare the fast path with the general parser; on by default.
inline std::atomic<bool>& fast_rows_enabled() {
    static std::atomic<bool> on{true};
    return on;
}

// The plain text cell at p, ending at the comma: prev when the row repeats it (checked first, as
// x and y mostly repeat), else the cell itself; nullptr for an empty cell, a blank, a CR, a line
// feed or the end of the buffer before the comma.
inline const char* plain_text_cell(const char* p, const char* end, std::string_view prev, std::string_view& cell) {
    const std::size_t len = prev.size();
    if (len > 0 && static_cast<std::size_t>(end - p) > len && p[len] == ',') {
        bool same = true;
        for (std::size_t i = 0; i < len; ++i) same = same && p[i] == prev[i];
        if (same) {
            cell = prev;
            return p + len + 1;
        }
    }
    const char* q = p;
    while (q < end && *q != ',') {
        const char c = *q;
        if (c == ' ' || c == '\t' || c == '\r' || c == '\n') return nullptr;
        ++q;
    }
    if (q == end || q == p) return nullptr;
    cell = std::string_view(p, static_cast<std::size_t>(q - p));
    return q + 1;
}

// One plain row at p (p < end; not a '#' or blank line: the first character is a digit, a sign or
// a point): fills `row` and returns the position after its line feed (end when the buffer ends
// the row), or nullptr when the general parser must read the row.
inline const char* scan_plain_row(const char* p, const char* end, std::string_view prev_x, std::string_view prev_y,
                                  plain_row& row) {
    const char c0 = *p;
    if (!(static_cast<unsigned>(c0 - '0') < 10u || c0 == '-' || c0 == '+' || c0 == '.')) return nullptr;
    p = plain_text_cell(p, end, prev_x, row.x_text);
    if (!p) return nullptr;
    p = plain_text_cell(p, end, prev_y, row.y_text);
    if (!p) return nullptr;
    p = scan_number(p, end, row.z, '.');
    if (!p || p == end || *p != ',') return nullptr;
    p = scan_number(p + 1, end, row.current, '.');
    if (!p) return nullptr;
    if (p == end) return p;
    return *p == '\n' ? p + 1 : nullptr;
}

}  // namespace tipgap::detail
