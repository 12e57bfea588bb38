#pragma once
// Declared output columns of the synthesiser's ground truth (tipgap/io/columns.hpp): the numbers
// `tipgap synth` reports after writing a curve or a grid.
#include <string>
#include <vector>

#include "tipgap/io/columns.hpp"
#include "tipgap/synth/synth.hpp"
#include "tipgap/synth/zv_synth.hpp"

namespace tipgap {

// The model over the whole gap range: kappa, phi_ap and the mean work function (4 decimals),
// the work functions, the gap at z = 0, the noise floor.
const std::vector<column<synth_truth>>& synth_truth_columns();

// One sweep: direction, usable points, the kappa and phi_ap a fit should find (4 decimals) and the
// model's own, its rows.
const std::vector<column<synth_sweep_truth>>& synth_sweep_columns();

// One region of a grid: name, pixels, sample work function (3 decimals), expected phi_ap and kappa
// (4 decimals), mean work function, the model's values over the range.
const std::vector<column<grid_region_truth>>& grid_region_columns();

// What `tipgap synth` prints after the file names, one '\n'-terminated line each:
// a curve: the model over o's gap range (kappa, phi_ap, mean work function) and each sweep's
// usable points and expected fit values;
std::string synth_curve_summary(const synth_curve& curve, const synth_options& o);
// a grid: each region's pixels, sample work function and expected phi_ap and kappa;
std::string synth_grid_summary(const synth_grid_truth& t);
// a z(V) trace: the sample work function and the resonance biases of the noise-free dz/dV (V).
std::string zv_trace_summary(const zv_synth_trace& t);

}  // namespace tipgap
