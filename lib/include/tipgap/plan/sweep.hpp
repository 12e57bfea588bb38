#pragma once
// Values given on the command line as one quantity, a list "a,b,c", or a range "FROM..TO".
#include <string_view>
#include <vector>

#include "tipgap/core/units.hpp"

namespace tipgap {

enum class spacing { linear, logarithmic };

// Parses "0.6nm", "0.4nm,0.6nm" or "0.4nm..1.2nm" (a range gets `points` values, >= 2, ends
// included; a single value or list ignores `points`). Logarithmic spacing needs FROM and TO of the
// same sign, both non-zero. Throws tipgap::error naming `option` on bad text.
std::vector<double> parse_sweep(std::string_view text, dimension d, int points, spacing sp, const std::string& option);

// True when the text is a range (contains "..").
bool is_range(std::string_view text);

}  // namespace tipgap
