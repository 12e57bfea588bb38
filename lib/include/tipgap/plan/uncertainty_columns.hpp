#pragma once
// Declared output columns of an uncertainty summary (tipgap/io/columns.hpp), shared by the
// outputs of predict and plan. Here, next to the result, so that the CLI and the Python module
// give the same keys.
#include <cstddef>
#include <string>
#include <vector>

#include "tipgap/io/columns.hpp"
#include "tipgap/plan/uncertainty.hpp"

namespace tipgap {

// The standard uncertainty of output `k` (Monte Carlo when drawn, else linear); NaN when the
// summary has no uncertain input or no such output. In the output's own unit (e.g. nm for gap_nm).
double standard_uncertainty(const uncertainty_summary& u, std::size_t k);

// CSV: NAME_stddev, NAME_ci95_low, NAME_ci95_high, NAME_linear_stddev for each of `names` (NaN for
// a summary without uncertain inputs). JSON (merged into the row, only when the summary has
// uncertain inputs): NAME_stddev, NAME_ci95 [low, high], NAME_mc_mean when drawn, and
// NAME_linear_stddev, NAME_linear_ci95 when computed.
std::vector<column<uncertainty_summary>> uncertainty_columns(const std::vector<std::string>& names);

// The "uncertainty" block of an output: inputs, Monte Carlo samples, seed, redrawn, failed, coverage.
record uncertainty_info(const uncertainty_summary& u);

// The first summary with uncertain inputs, or nullptr.
const uncertainty_summary* first_uncertain(const std::vector<uncertainty_summary>& u);

// "# ± : ..." saying what the ± of a table is (Monte Carlo with draws and seed, or linear
// propagation, and the inputs), '\n'-terminated; "" without uncertain inputs. of: what it is the
// uncertainty of (" of I"), or "".
std::string uncertainty_line(const std::vector<uncertainty_summary>& u, const char* of);

}  // namespace tipgap
