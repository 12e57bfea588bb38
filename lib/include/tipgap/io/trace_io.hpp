#pragma once
// Reading one bias-sweep trace per CSV file: a constant-current z(V) trace or a dI/dV(V) trace.
//
// File layout (the curve reader's dialect and helpers: "# key: value" metadata, "name [unit]"
// header, comma-separated rows; tipgap/io/curve_io.hpp):
//   # current: 1 nA                   setpoint current of the feedback (also `setpoint_current`)
//   bias [V],z [nm]                   or  bias [V],didv [nS]   (didv also dIdV or dI/dV)
//   4.00,3.2000
// Columns: `bias` (voltage) and `z` (length; relative, the instrument's zero anywhere) or `didv`
// (conductance, or `a.u.` for a lock-in signal in arbitrary units). Other columns are ignored.
// Rows are sorted by bias on reading; a repeated bias is an error.
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tipgap/io/curve_io.hpp"

namespace tipgap {

enum class trace_kind {
    zv,    // z(V) at constant current: resonances are peaks of dz/dV
    didv,  // dI/dV(V) with the feedback on: resonances are peaks of dI/dV
};
const char* to_string(trace_kind k);

struct bias_trace {
    std::string file;                  // path as given
    curve_metadata metadata;
    trace_kind kind = trace_kind::zv;
    std::vector<double> bias_V;        // ascending, V
    std::vector<double> signal;        // z (m) or dI/dV (S, or arbitrary units), same order
    bool arbitrary_units = false;      // didv given in a.u.
    std::optional<double> current_A;   // `# current:` or `# setpoint_current:` (A)
};

// Reads and parses a trace file. Throws tipgap::error (input) with file:line:column for: an empty
// file, a missing header, no bias column or neither z nor didv column, a column without or with an
// unknown unit, a bad cell, a row with the wrong number of cells, a bad `current` value, a repeated
// bias, or fewer than 8 rows.
bias_trace read_bias_trace(const std::string& path);

// Parses the text of a trace file; `file` names it in errors.
bias_trace parse_bias_trace(std::string_view text, const std::string& file);

}  // namespace tipgap
