#pragma once
// The figure of one fitted sweep: ln|I| against z with the fit and its confidence band, the
// residuals, and the local apparent barrier φ_ap(z). Builds a plot::figure; write it with
// plot::write_figure.
#include <string>

#include "tipgap/io/curve_io.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/fit/model_fit.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap {

// sweep: the sweep that was fitted; fit: its result (fit_sweep); model: the model comparison of the
// same sweep or nullptr; title: figure title (e.g. the file name and direction).
// The band is the confidence band of the fitted mean ln|I| at fit.confidence_level (Student t,
// statistical covariance of the line), drawn for the linear model; the offset model shows its
// curve only.
plot::figure make_fit_figure(const curve_sweep& sweep, const fit_result& fit, const model_fit_result* model,
                             const std::string& title);

// Where the figure of sweep `index` (0-based) of `count` goes: `path` itself when count is 1,
// else "<stem>-<index+1><ext>" beside it (e.g. fit.png -> fit-1.png, fit-2.png).
std::string numbered_plot_path(const std::string& path, std::size_t index, std::size_t count);

}  // namespace tipgap
