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

// A row with `cells` cells under a header (on line header_line) of `columns` columns.
[[noreturn]] void throw_cell_count(const location& where, int cells, int header_line, std::size_t columns);

}  // namespace tipgap::detail
