#pragma once
// Declared output columns of a planned setpoint (tipgap/io/columns.hpp): what `plan` prints as a
// table, CSV and JSON. In the library, next to the result, for the CLI and the Python module alike.
#include <string>
#include <vector>

#include "tipgap/io/columns.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/uncertainty.hpp"

namespace tipgap {

// One setpoint as `plan` reports it: the point and the uncertainty of its outputs.
struct plan_row {
    const plan_point* point = nullptr;
    const uncertainty_summary* uncertainty = nullptr;  // inputs empty: no uncertainty
};

// bias, requested current (signed like the bias; the table shows its magnitude), gap ± u, model
// current (JSON), R, G0, kappa, nm per decade ± u, phi_ap ± u, regime (null, "unreachable" in the
// table, when the setpoint cannot be reached), status, evaluations, warnings (JSON), then
// uncertainty_columns(uncertainty_names).
std::vector<column<plan_row>> plan_columns(const std::vector<std::string>& uncertainty_names);

}  // namespace tipgap
