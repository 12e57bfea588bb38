#pragma once
// The figures of `tipgap demo`: the prediction over its gap sweep. (The fit figures are
// make_fit_figure's, tipgap/figures/fit_plot.hpp.)
#include "tipgap/demo/demo.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap {

// |I| (log axis) and phi_ap against the gap, with the mean work function marked. r.sweep must not
// be empty.
plot::figure demo_prediction_figure(const demo_report& r);

}  // namespace tipgap
