// Messages about data rows shared by the curve and grid readers; see csv_errors.hpp.
#include "io/detail/csv_errors.hpp"

#include <fmt/format.h>

namespace tipgap::detail {

void throw_bad_number(const location& where, std::string_view column_name, std::string_view cell, number_status status) {
    // The name as read from the header (any text, when the column was chosen by index).
    const std::string column = quote_input(column_name, 30);
    switch (status) {
        case number_status::empty:
            throw_input(where, fmt::format("empty cell in column {}; expected a number", column));
        case number_status::not_finite:
            throw_input(where, fmt::format("{} in column {} is not a finite number; expected a finite value",
                                           quote_input(cell), column));
        case number_status::out_of_range:
            throw_input(where, fmt::format("{} in column {} is outside the range of a double; expected a magnitude of 0 "
                                           "or between about 1e-308 and 1e308",
                                           quote_input(cell), column));
        default:
            throw_input(where, fmt::format("{} in column {} is not a number; expected a plain number such as 0.25 (the "
                                           "unit goes in the header)",
                                           quote_input(cell), column));
    }
}

void throw_cell_count(const location& where, int cells, std::string_view header, std::size_t columns) {
    throw_input(where, fmt::format("the row has {} cell{}; {} has {} columns", cells, cells == 1 ? "" : "s", header, columns));
}

void throw_rising_current(const location& where, std::string_view evidence, bool flipped) {
    throw_input(where, fmt::format("|I| rises with z ({}): z must grow as the tip retracts; {}", evidence,
                                   flipped ? "this file was read with --flip-z, which it does not need"
                                           : "if z in this file grows as the tip approaches, read it with --flip-z"));
}

}  // namespace tipgap::detail
