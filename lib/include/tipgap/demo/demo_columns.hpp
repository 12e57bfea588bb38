#pragma once
// Declared output columns of the demo report (tipgap/io/columns.hpp): fits.csv, prediction.csv,
// demo.json and the summary table that `tipgap demo` prints.
#include <cstddef>
#include <string>
#include <vector>

#include "tipgap/demo/demo.hpp"
#include "tipgap/io/columns.hpp"

namespace tipgap {

// One fitted demo sweep: file, direction, kappa and phi_ap (± their errors in the table), their
// intervals, nm per decade, the truth and whether kappa's interval holds it, the model comparison
// with its truth. The table shows the file name without its directory and "-" where nothing was
// compared.
const std::vector<column<demo_curve>>& demo_curve_columns();

// The prediction sweep: gap, bias, current, G0, kappa, phi_ap, regime, warnings (JSON).
const std::vector<column<prediction>>& demo_prediction_columns();

// The setpoint ladder (JSON): bias, setpoint current, gap (null when unreachable), G0, nm per
// decade, phi_ap, regime, warnings.
const std::vector<column<plan_point>>& demo_plan_columns();

// Sweeps compared with a truth file, and how many had the true kappa inside their interval.
struct demo_tally {
    std::size_t compared = 0;
    std::size_t kappa_within = 0;
    std::size_t offsets_compared = 0;  // offset-model fits with a truth file
    std::size_t offset_within = 0;     // of those, the baseline inside the offset's interval
};
demo_tally tally(const demo_report& r);

// fit-<stem>.png, or fit-<stem>-<direction>.png for a file with several sweeps.
std::string demo_plot_name(const demo_curve& d);

// One analysed z(V) trace of demo_scans/resonances/: file, peaks (order, bias_V, bias_stderr_V),
// truth peaks, work function (fit with stderr and interval, formula), truth and whether the
// interval holds it, largest peak error (JSON), status. The table shows "-" where there is no truth.
const std::vector<column<demo_resonance>>& demo_resonance_columns();

// resonance-<stem>.png
std::string demo_resonance_plot_name(const demo_resonance& d);

// demo.json: command, synthetic_data, config, prediction, plan, curves (each with the path of its
// figure in out_dir), summary, resonances.
record demo_document(const demo_report& r, const std::string& out_dir);

}  // namespace tipgap
