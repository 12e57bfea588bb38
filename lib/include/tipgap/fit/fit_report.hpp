#pragma once
// The prose under the table of fitted sweeps (`tipgap fit`): the model comparison and the notes.
#include <string>
#include <vector>

#include "tipgap/fit/fitted_sweep.hpp"

namespace tipgap {

// The model comparison of each sweep that has one (mean work function, gap offset, ln prefactor,
// phi_ap against the mean work function, the fit's warnings), under a heading; "" when none has.
std::string model_comparison_text(const std::vector<fitted_sweep>& all);

// "notes:" and each sweep's warnings, the confidence level when it is not 95 %, and where each
// figure went (plot_path); "" when there is nothing to note.
std::string fit_notes_text(const std::vector<fitted_sweep>& all);

}  // namespace tipgap
