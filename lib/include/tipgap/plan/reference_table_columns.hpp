#pragma once
// Declared output columns of a row of the teaching table (tipgap/io/columns.hpp): what `table`
// prints as a table, CSV and JSON, next to the result for the CLI and the Python module alike.
#include <string>
#include <vector>

#include "tipgap/config/config.hpp"

#include "tipgap/io/columns.hpp"
#include "tipgap/plan/reference_table.hpp"

namespace tipgap {

// sample, its work function, mean barrier, kappa, nm per decade, de Broglie wavelength, then the
// full model's gap, phi_ap and nm per decade at the reference setpoint; warnings (JSON).
const std::vector<column<reference_row>>& reference_columns();

// The '#' lines above the table: the config's tip (material, work function) and geometry, the
// reference setpoint (current_A in A, bias_V in V), and how each column is computed.
std::string reference_table_header(const config& c, double current_A, double bias_V);

}  // namespace tipgap
