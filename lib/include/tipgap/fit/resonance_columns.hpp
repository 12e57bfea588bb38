#pragma once
// Declared output columns of the resonance analysis (tipgap/io/columns.hpp): the peak rows and the
// work-function summary that `tipgap resonances` and `tipgap demo` write.
#include <string>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/fit/resonances.hpp"
#include "tipgap/io/columns.hpp"
#include "tipgap/io/report.hpp"
#include "tipgap/io/trace_io.hpp"

namespace tipgap {

// One found peak with the position of the same order in the best model trace (NaN when none).
struct resonance_peak_row {
    resonance_peak peak;
    double model_bias_V = 0;  // (V)
};
std::vector<resonance_peak_row> resonance_peak_rows(const resonance_result& r);

// order, bias_V (± bias_stderr_V in the table), bias_stderr_V, modulation, model_bias_V.
const std::vector<column<resonance_peak_row>>& resonance_peak_columns();

// The summary: smoothing, field, work function (fit, its stderr and interval; formula and its
// stderr), model traces, status, message. JSON keys in eV and V/nm.
const std::vector<column<resonance_result>>& resonance_result_columns();

// The JSON document of `tipgap resonances`: command, file, config, trace, current_A, peaks
// (order, bias_V, bias_stderr_V, modulation, model_bias_V) and the summary columns.
record resonance_document(const bias_trace& t, const config& c, const resonance_result& r);

// The summary as text lines, each starting with `prefix` ("# " above a CSV).
std::string resonance_summary_text(const resonance_result& r, const std::string& prefix);

// The whole report in format f: the JSON document; the summary as '#' lines above the peaks' CSV;
// or a '#' line naming the trace (file, kind, points, smoothing), the peak table and the summary.
std::string resonance_report(output_format f, const bias_trace& t, const config& c, const resonance_result& r);

}  // namespace tipgap
