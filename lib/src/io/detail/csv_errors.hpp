#pragma once
// The messages about data rows shared by the curve and grid readers, so that both say the same
// about the same mistake.
#include <cstddef>
#include <string_view>

#include "io/detail/csv_scan.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap::detail {

// A cell of a numeric column that is not a usable number; status: what parse_double said of it.
[[noreturn]] void throw_bad_number(const location& where, std::string_view column_name, std::string_view cell,
                                   number_status status);

// A row with `cells` cells under a header of `columns` columns; header: "the header on line 3"
// (csv_header::describe).
[[noreturn]] void throw_cell_count(const location& where, int cells, std::string_view header, std::size_t columns);

// A curve, or most pixels of a grid, whose |I| clearly rises with z (io/orientation.hpp). evidence:
// what shows it, e.g. "median 1 nA over the quarter of the points with the largest z, 2 pA over
// the quarter with the smallest"; flipped: the file was read with z flipped.
[[noreturn]] void throw_rising_current(const location& where, std::string_view evidence, bool flipped);

}  // namespace tipgap::detail
