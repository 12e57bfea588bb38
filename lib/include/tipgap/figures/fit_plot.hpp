#pragma once
// The figure of one fitted sweep: log10 |I| (in pA, nA or µA, chosen for the data) against z with
// the fit, its 95 % confidence band and the band that holds 95 % of the points, the residuals with
// both bands, and the local apparent barrier φ_ap(z). Builds a plot::figure; write it with
// plot::write_figure.
#include <string>
#include <vector>

#include "tipgap/io/curve_io.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/fit/fitted_sweep.hpp"
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

// One fitted sweep, as far as its figure's file name and title are concerned.
struct fit_plot_source {
    std::string file;                                   // the curve file it came from, any path
    sweep_direction direction = sweep_direction::unknown;
};

// Where the figures of `sources` go, given --plot `path`: `path` itself for a single sweep; else
// "<stem>-<input stem><ext>" beside it, with "-<direction>" added when one file gave several sweeps
// (fit.png, a.csv and b.csv -> fit-a.png, fit-b.png; a file with two sweeps -> fit-a-approach.png,
// fit-a-retract.png). Names that would still collide get "-2", "-3", ... in order.
std::vector<std::string> fit_plot_paths(const std::string& path, const std::vector<fit_plot_source>& sources);

// The title of a sweep's figure: the file's base name (no directories) and the direction, e.g.
// "run7.csv (approach)".
std::string fit_plot_title(const fit_plot_source& source);

// One figure per sweep of `all` (make_fit_figure, titled fit_plot_title) at the paths
// fit_plot_paths(path, ...) gives, each recorded in its sweep's plot_path. path: FILE.png, .svg or
// .pdf. Throws tipgap::error (input) when a figure cannot be written.
void write_fit_plots(std::vector<fitted_sweep>& all, const std::string& path);

}  // namespace tipgap
