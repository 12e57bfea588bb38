#pragma once
// What `tipgap demo` prints and writes from a demo_report: the summary text on standard output and
// the report directory (CSV, JSON and PNG figures).
#include <string>

#include "tipgap/demo/demo.hpp"

namespace tipgap {

// The config, the prediction at the middle of the sweep and the setpoint ladder: three lines, each
// '\n'-terminated. r.sweep must not be empty; o: the options r was made with.
std::string demo_overview_text(const demo_report& r, const demo_options& o);

// The fit table of the demo curves with their truth, the tally of kappa (and, for offset-model
// fits, offset) intervals holding it, the resonance table (when there are traces) and a note for
// each file without a truth file.
std::string demo_results_text(const demo_report& r, const demo_options& o);

// Writes prediction.csv, fits.csv, demo.json, prediction.png and one figure per fitted sweep
// (demo_plot_name) and per trace (demo_resonance_plot_name) into a hidden sibling directory that
// replaces `out` in one rename at the end (tipgap/io/atomic_directory.hpp). Throws tipgap::error
// (input) when `out` cannot be replaced or a file cannot be written.
void write_demo_directory(const demo_report& r, const std::string& out);

}  // namespace tipgap
