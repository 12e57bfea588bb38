#pragma once
// Declared output columns of a row of the teaching table (tipgap/io/columns.hpp): what `table`
// prints as a table, CSV and JSON, next to the result for the CLI and the Python module alike.
#include <vector>

#include "tipgap/io/columns.hpp"
#include "tipgap/plan/reference_table.hpp"

namespace tipgap {

// sample, its work function, mean barrier, kappa, nm per decade, de Broglie wavelength, then the
// full model's gap, phi_ap and nm per decade at the reference setpoint; warnings (JSON).
const std::vector<column<reference_row>>& reference_columns();

}  // namespace tipgap
