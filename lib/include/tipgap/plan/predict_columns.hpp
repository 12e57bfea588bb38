#pragma once
// Declared output columns of a prediction (tipgap/io/columns.hpp): what `predict` prints as a
// table, CSV and JSON, and the demo reuses. In the library, next to the result, so that the
// Python module builds dicts with the same keys, units and values.
#include <string>
#include <vector>

#include "tipgap/io/columns.hpp"
#include "tipgap/plan/predict.hpp"
#include "tipgap/plan/uncertainty.hpp"

namespace tipgap {

// Every output of one prediction: gap, bias, temperature, J, I, G (S and G0), dJ/dV density (JSON),
// kappa, nm per decade, phi_ap, barrier top and width, regime, warnings (JSON).
const std::vector<column<prediction>>& prediction_columns();

// One point as `predict` reports it: the prediction and the uncertainty of its outputs.
struct predict_row {
    const prediction* point = nullptr;
    const uncertainty_summary* uncertainty = nullptr;  // inputs empty: no uncertainty
};

// prediction_columns() with "I ± u" in the table, then uncertainty_columns(uncertainty_names)
// (empty: no uncertainty columns in the CSV).
std::vector<column<predict_row>> predict_columns(const std::vector<std::string>& uncertainty_names);

}  // namespace tipgap
