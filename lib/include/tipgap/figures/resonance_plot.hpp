#pragma once
// The figure of a resonance analysis: the measured trace with the fitted model trace, and the
// smoothed dz/dV (or dI/dV) with the peaks marked. Builds a plot::figure; write it with
// plot::write_figure.
#include <string>

#include "tipgap/fit/resonances.hpp"
#include "tipgap/io/trace_io.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap {

// trace: the measured trace; r: its analysis (analyse_resonances); title: figure title.
plot::figure make_resonance_figure(const bias_trace& trace, const resonance_result& r, const std::string& title);

}  // namespace tipgap
