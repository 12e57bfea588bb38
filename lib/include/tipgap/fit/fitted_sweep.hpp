#pragma once
// One fitted sweep as `tipgap fit` reports it: the fit, and the model comparison when asked for.
#include <optional>
#include <string>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/fit/model_fit.hpp"
#include "tipgap/io/curve_io.hpp"

namespace tipgap {

struct fitted_sweep {
    const measured_curve* curve = nullptr;  // the file the sweep came from (outlives this)
    const curve_sweep* sweep = nullptr;     // the sweep within it
    fit_result result;
    std::optional<model_fit_result> model;  // the model comparison, when a config was given
    std::string plot_path;                  // where its figure was written, when one was
};

// Fits every sweep of `curve` (fit_curve) and, with a model config, fits the tunnelling model to
// each (fit_model_to_sweep, at options.confidence_level), at the curve's temperature when its
// metadata state one (else the config's). The model takes its points and weights
// from the linear fit of the sweep, refitted when options.model is offset. `curve` must outlive
// the result. Throws as fit_curve and fit_model_to_sweep.
std::vector<fitted_sweep> fit_and_compare(const measured_curve& curve, const fit_options& options,
                                          const config* model_config);

}  // namespace tipgap
