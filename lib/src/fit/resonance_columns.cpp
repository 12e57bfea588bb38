#include "tipgap/fit/resonance_columns.hpp"

#include <fmt/format.h>
#include <limits>

#include "tipgap/config/config_summary.hpp"
#include "tipgap/core/constants.hpp"

namespace tipgap {
namespace {
constexpr double J_per_eV = si::electron_volt;
constexpr scaling to_eV = divided_by(J_per_eV);
}  // namespace

std::vector<resonance_peak_row> resonance_peak_rows(const resonance_result& r) {
    std::vector<resonance_peak_row> rows;
    for (std::size_t k = 0; k < r.peaks.size(); ++k)
        rows.push_back({r.peaks[k], k < r.model_peaks_V.size() ? r.model_peaks_V[k] : std::numeric_limits<double>::quiet_NaN()});
    return rows;
}

const std::vector<column<resonance_peak_row>>& resonance_peak_columns() {
    using p = resonance_peak_row;
    static const std::vector<column<p>> columns = {
        {"order", "n", [](const p& x) { return x.peak.order; }},
        {.key = "bias_V", .label = "bias [V]", .get = [](const p& x) { return x.peak.bias_V; }, .number = fixed(3),
         .spread = [](const p& x) { return x.peak.bias_stderr_V; }},
        {"bias_stderr_V", "", [](const p& x) { return x.peak.bias_stderr_V; }, {}, {}, in_data},
        {"modulation", "modulation", [](const p& x) { return x.peak.modulation; }, {}, {number_style::significant, 3}},
        {.key = "model_bias_V", .label = "model [V]", .get = [](const p& x) { return x.model_bias_V; }, .number = fixed(3),
         .none = "-"},
    };
    return columns;
}

const std::vector<column<resonance_result>>& resonance_result_columns() {
    using r = resonance_result;
    static const std::vector<column<r>> columns = {
        {"smoothing_width_V", "smoothing [V]", [](const r& x) { return x.smoothing_width_V; }},
        {"field_V_per_nm", "field [V/nm]", [](const r& x) { return x.field_V_per_m; }, times(1e-9), {number_style::significant, 3}},
        {.key = "work_function_eV", .label = "W fit [eV]", .get = [](const r& x) { return x.work_function_J; }, .scale = to_eV,
         .number = fixed(3), .spread = [](const r& x) { return x.work_function_stderr_J / J_per_eV; }},
        {"work_function_stderr_eV", "", [](const r& x) { return x.work_function_stderr_J; }, to_eV, {}, in_data},
        {"work_function_ci_low_eV", "CI low [eV]", [](const r& x) { return x.work_function_ci_low_J; }, to_eV, fixed(3), in_table},
        {"work_function_ci_high_eV", "CI high [eV]", [](const r& x) { return x.work_function_ci_high_J; }, to_eV, fixed(3), in_table},
        {"work_function_ci_eV", "", [](const r& x) {
             return cell(cell::list{x.work_function_ci_low_J / J_per_eV, x.work_function_ci_high_J / J_per_eV});
         }, {}, {}, in_json},
        {"confidence_level", "level", [](const r& x) { return x.confidence_level; }},
        {.key = "work_function_formula_eV", .label = "W formula [eV]", .get = [](const r& x) { return x.work_function_formula_J; },
         .scale = to_eV, .number = fixed(3), .spread = [](const r& x) { return x.work_function_formula_stderr_J / J_per_eV; }},
        {"work_function_formula_stderr_eV", "", [](const r& x) { return x.work_function_formula_stderr_J; }, to_eV, {}, in_data},
        {"model_traces", "model traces", [](const r& x) { return x.model_traces; }},
        {"status", "status", [](const r& x) { return to_string(x.status); }},
        {"message", "message", [](const r& x) { return x.message; }},
    };
    return columns;
}

record resonance_document(const bias_trace& t, const config& c, const resonance_result& r) {
    record j;
    j.set("command", "resonances");
    j.set("file", t.file);
    j.set("config", config_record(c));
    j.set("trace", to_string(t.kind));
    j.set("current_A", t.current_A ? cell(*t.current_A) : cell());
    j.set("peaks", to_records(resonance_peak_columns(), resonance_peak_rows(r)));
    for (auto& [k, v] : to_record(resonance_result_columns(), r).fields) j.set(k, std::move(v));
    return j;
}

std::string resonance_summary_text(const resonance_result& r, const std::string& prefix) {
    const auto& cols = resonance_result_columns();
    std::string s = prefix + format_line(cols, r,
                                         "work function (exact-model fit): {work_function_eV} eV, interval "
                                         "[{work_function_ci_low_eV}, {work_function_ci_high_eV}] eV at level "
                                         "{confidence_level} ({model_traces} model traces)\n");
    s += prefix + format_line(cols, r, "work function (triangular-well formula, field {field_V_per_nm} V/nm): "
                                       "{work_function_formula_eV} eV\n");
    s += prefix + fmt::format("status: {}{}\n", to_string(r.status), r.message.empty() ? "" : " (" + r.message + ")");
    return s;
}

std::string resonance_report(output_format f, const bias_trace& t, const config& c, const resonance_result& r) {
    const auto rows = resonance_peak_rows(r);
    if (f == output_format::json) return json_text(resonance_document(t, c, r));
    if (f == output_format::csv) return resonance_summary_text(r, "# ") + format_csv(resonance_peak_columns(), rows);
    return fmt::format("# {} · {} trace · {} points · smoothing {:g} V\n", t.file, to_string(t.kind), t.bias_V.size(),
                       r.smoothing_width_V) +
           format_table(resonance_peak_columns(), rows) + resonance_summary_text(r, "");
}

}  // namespace tipgap
