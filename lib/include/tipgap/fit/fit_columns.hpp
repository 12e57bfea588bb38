#pragma once
// Declared output columns of curve fits (tipgap/io/columns.hpp): what `fit` prints as a table,
// CSV and JSON, next to the results for the CLI and the Python module alike.
#include <vector>

#include "tipgap/fit/fit.hpp"
#include "tipgap/fit/fitted_sweep.hpp"
#include "tipgap/fit/model_fit.hpp"
#include "tipgap/io/columns.hpp"

namespace tipgap {

// The contact found on a sweep (JSON "contact"): kind, z_nm, conductance_G0 and gap_offset_nm
// (NaN without a contact), points_in_contact.
const std::vector<column<contact_result>>& contact_columns();

// One window of the phi_ap(z) profile (JSON "profile").
const std::vector<column<profile_point>>& profile_columns();

// The model comparison (JSON "model_fit"); numbers to 3 decimals in prose.
const std::vector<column<model_fit_result>>& model_fit_columns();

// Every output of a fitted sweep: file, direction, model, status, kappa and phi_ap with errors
// and intervals, nm per decade, prefactor, offset, statistics, point counts, noise, saturation,
// contact, profile, metadata, model comparison (JSON), plot, warnings. The table (fixed widths, no
// rule) shows file, sweep, model, kappa, phi_ap with their errors, the phi_ap interval, nm/decade,
// R^2 and points used/total. with_model: the CSV also gets the model comparison's columns
// (model_mean_work_function_eV, ..., model_status).
std::vector<column<fitted_sweep>> fitted_sweep_columns(bool with_model);

}  // namespace tipgap
