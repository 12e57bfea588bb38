#pragma once
// A measured curve held in memory (e.g. arrays from the user's own reader, through the Python
// module), made into the same measured_curve a curve file gives, so that fit_curve and
// fit_and_compare treat it exactly as they treat a file.
#include <string>
#include <vector>

#include "tipgap/io/curve_io.hpp"

namespace tipgap {

// name: stands for the file in messages and outputs. z_m (m) and current_A (A): the rows in
// recorded order, same length >= 3, finite. bias_V: sample bias (V), NaN when unknown (no `bias`
// metadata then). The rows are split into sweeps where z turns back (split_at_turns), as for a file
// without a direction column. Throws tipgap::error (input) with key "z" or "current".
measured_curve curve_from_arrays(const std::string& name, std::vector<double> z_m, std::vector<double> current_A,
                                 double bias_V);

}  // namespace tipgap
