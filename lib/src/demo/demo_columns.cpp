#include "tipgap/demo/demo_columns.hpp"

#include <filesystem>
#include <fmt/format.h>
#include <limits>

#include "tipgap/config/config_summary.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/fit/resonance_columns.hpp"
#include "tipgap/plan/predict_columns.hpp"

namespace tipgap {

namespace {

constexpr double J_per_eV = si::electron_volt;
constexpr scaling to_eV = divided_by(J_per_eV), to_per_nm = times(1e-9);

record truth_record_of(const demo_curve& d) {
    record t;
    t.set("decay_constant_expected_per_nm", d.sweep_truth->decay_constant_expected_per_m * 1e-9);
    t.set("decay_constant_model_per_nm", d.sweep_truth->decay_constant_model_per_m * 1e-9);
    t.set("apparent_barrier_expected_eV", d.sweep_truth->apparent_barrier_expected_J / J_per_eV);
    t.set("mean_work_function_eV", d.truth->mean_work_function_J / J_per_eV);
    t.set("seed", d.truth->seed);
    return t;
}

// How the file was read: the reader options that differ from the defaults (true for flip_z).
record read_record_of(const demo_curve& d) {
    record r;
    for (const auto& [k, v] : settings(d.read)) r.set(k, v.empty() ? std::string("true") : v);
    return r;
}

record model_record_of(const demo_curve& d) {
    const model_fit_result& m = *d.model;
    record r;
    r.set("status", to_string(m.status));
    r.set("mean_work_function_eV", m.mean_work_function_J / J_per_eV);
    r.set("mean_work_function_stderr_eV", m.mean_work_function_stderr_J / J_per_eV);
    r.set("gap_offset_nm", m.gap_offset_m * 1e9);
    r.set("gap_offset_stderr_nm", m.gap_offset_stderr_m * 1e9);
    r.set("model_apparent_barrier_eV", m.model_apparent_barrier_J / J_per_eV);
    r.set("work_function_within_ci", d.work_function_within);
    r.set("warnings", m.warnings);
    return r;
}

}  // namespace

const std::vector<column<demo_curve>>& demo_curve_columns() {
    using d = demo_curve;
    auto no = [] { return cell(absent{}); };
    static const std::vector<column<d>> columns = {
        {.key = "file", .get = [](const d& x) { return x.curve->file; }, .shown = in_data},
        {.key = "file", .label = "file", .get = [](const d& x) { return std::filesystem::path(x.curve->file).filename().string(); },
         .shown = in_table},
        {"direction", "sweep", [](const d& x) { return to_string(x.fit.direction); }},
        {"model", "model", [](const d& x) { return to_string(x.fit.model); }},
        {.key = "decay_constant_per_nm", .label = "kappa [1/nm]", .get = [](const d& x) { return x.fit.decay_constant_per_m; },
         .scale = to_per_nm, .number = fixed(3), .spread = [](const d& x) { return x.fit.decay_constant_stderr_per_m * 1e-9; }},
        {"decay_constant_stderr_per_nm", "", [](const d& x) { return x.fit.decay_constant_stderr_per_m; }, to_per_nm, {}, in_data},
        {"decay_constant_ci_low_per_nm", "", [](const d& x) { return x.fit.decay_constant_ci_low_per_m; }, to_per_nm, {}, in_json},
        {"decay_constant_ci_high_per_nm", "", [](const d& x) { return x.fit.decay_constant_ci_high_per_m; }, to_per_nm, {}, in_json},
        {.key = "apparent_barrier_eV", .label = "phi_ap [eV]", .get = [](const d& x) { return x.fit.apparent_barrier_J; },
         .scale = to_eV, .number = fixed(3), .spread = [](const d& x) { return x.fit.apparent_barrier_stderr_J / J_per_eV; }},
        {"apparent_barrier_stderr_eV", "", [](const d& x) { return x.fit.apparent_barrier_stderr_J; }, to_eV, {}, in_data},
        {"nm_per_decade", "", [](const d& x) { return x.fit.length_per_decade_m; }, times(1e9), {}, in_json},
        {"points_used", "", [](const d& x) { return x.fit.points_used; }, {}, {}, in_json},
        {"r_squared", "", [](const d& x) { return x.fit.r_squared; }, {}, {}, in_json},
        {"contact", "", [](const d& x) { return to_string(x.fit.contact.kind); }, {}, {}, in_json},
        {"saturation_detected", "", [](const d& x) { return x.fit.saturation_detected; }, {}, {}, in_json},
        {"warnings", "", [](const d& x) { return x.fit.warnings; }, {}, {}, in_json},
        {"read_options", "", [](const d& x) { return read_record_of(x); }, {}, {}, in_json},
        {"truth", "", [no](const d& x) { return x.sweep_truth ? cell(truth_record_of(x)) : no(); }, {}, {}, in_json},
        {"truth_decay_constant_per_nm", "truth kappa",
         [no](const d& x) { return x.sweep_truth ? cell(x.truth_decay_constant_per_m) : no(); }, to_per_nm, fixed(3),
         in_csv | in_table, {}, "-"},
        {"truth_apparent_barrier_eV", "truth phi_ap",
         [no](const d& x) { return x.sweep_truth ? cell(apparent_barrier_from_decay(x.truth_decay_constant_per_m)) : no(); },
         to_eV, fixed(3), in_table, {}, "-"},
        {"kappa_within_ci", "kappa in 95% CI", [no](const d& x) { return x.sweep_truth ? cell(x.kappa_within) : no(); }, {}, {},
         everywhere, {}, "-"},
        {.key = "offset_pA", .label = "offset [pA]",
         .get = [no](const d& x) { return x.fit.model == fit_model::offset ? cell(x.fit.offset_A) : no(); }, .scale = times(1e12),
         .number = fixed(2), .spread = [](const d& x) { return x.fit.offset_stderr_A * 1e12; }, .none = "-"},
        {"offset_stderr_pA", "", [no](const d& x) { return x.fit.model == fit_model::offset ? cell(x.fit.offset_stderr_A) : no(); },
         times(1e12), {}, in_data, {}, "-"},
        {"truth_offset_pA", "truth offset",
         [no](const d& x) { return x.fit.model == fit_model::offset && x.truth ? cell(x.truth->baseline_A) : no(); }, times(1e12),
         fixed(2), everywhere, {}, "-"},
        {"offset_within_ci", "", [no](const d& x) { return x.fit.model == fit_model::offset && x.truth ? cell(x.offset_within) : no(); },
         {}, {}, in_data, {}, "-"},
        {"model_fit", "", [no](const d& x) { return x.model ? cell(model_record_of(x)) : no(); }, {}, {}, in_json},
        {"model_mean_work_function_eV", "model W [eV]",
         [no](const d& x) { return x.model ? cell(x.model->mean_work_function_J) : no(); }, to_eV, fixed(3), in_csv | in_table,
         [](const d& x) { return x.model ? x.model->mean_work_function_stderr_J / J_per_eV : std::numeric_limits<double>::quiet_NaN(); },
         "-"},
        {"model_mean_work_function_stderr_eV", "",
         [no](const d& x) { return x.model ? cell(x.model->mean_work_function_stderr_J) : no(); }, to_eV, {}, in_csv},
        {"truth_mean_work_function_eV", "truth W [eV]",
         [no](const d& x) { return x.truth ? cell(x.truth->mean_work_function_J) : no(); }, to_eV, fixed(3), in_csv | in_table, {},
         "-"},
    };
    return columns;
}

const std::vector<column<prediction>>& demo_prediction_columns() {
    static const std::vector<column<prediction>> columns =
        select_columns(prediction_columns(), {"gap_nm", "bias_V", "current_A", "conductance_G0", "decay_constant_per_nm",
                                              "apparent_barrier_eV", "regime", "warnings"});
    return columns;
}

const std::vector<column<plan_point>>& demo_plan_columns() {
    using p = plan_point;
    static const std::vector<column<p>> columns = {
        {"bias_V", "", [](const p& x) { return x.bias_V; }},
        {"current_A", "", [](const p& x) { return x.setpoint_A; }},
        {"gap_nm", "", [](const p& x) { return x.reachable() ? cell(x.solution.gap_m * 1e9) : cell(); }},
        {"conductance_G0", "", [](const p& x) { return x.conductance_G0; }},
        {"nm_per_decade", "", [](const p& x) { return x.nm_per_decade; }},
        {"apparent_barrier_eV", "", [](const p& x) { return x.apparent_barrier_J; }, to_eV},
        {"regime", "", [](const p& x) { return to_string(x.kind); }},
        {"warnings", "", [](const p& x) { return x.warnings; }},
    };
    return columns;
}

demo_tally tally(const demo_report& r) {
    demo_tally t;
    for (const demo_curve& d : r.curves) {
        if (!d.sweep_truth) continue;
        ++t.compared;
        t.kappa_within += d.kappa_within ? 1 : 0;
        if (d.truth && d.fit.model == fit_model::offset) {
            ++t.offsets_compared;
            t.offset_within += d.offset_within ? 1 : 0;
        }
    }
    return t;
}

std::string demo_plot_name(const demo_curve& d) {
    const std::string stem = std::filesystem::path(d.curve->file).stem().string();
    return d.curve->sweeps.size() > 1 ? fmt::format("fit-{}-{}.png", stem, to_string(d.fit.direction))
                                      : fmt::format("fit-{}.png", stem);
}

namespace {
std::string peak_list(const std::vector<double>& v) {
    std::string s;
    for (double x : v) s += fmt::format("{}{:.3f}", s.empty() ? "" : " ", x);
    return s.empty() ? "-" : s;
}
std::vector<double> found_peaks(const demo_resonance& d) {
    std::vector<double> v;
    for (const resonance_peak& p : d.result.peaks) v.push_back(p.bias_V);
    return v;
}
record resonance_truth_record(const demo_resonance& d) {
    record t;
    t.set("sample_work_function_eV", d.truth->sample_work_function_J / J_per_eV);
    cell::list peaks;
    for (double v : d.truth->peaks_V) peaks.emplace_back(v);
    t.set("peaks_V", std::move(peaks));
    return t;
}
}  // namespace

const std::vector<column<demo_resonance>>& demo_resonance_columns() {
    using d = demo_resonance;
    auto no = [] { return cell(absent{}); };
    static const std::vector<column<d>> columns = {
        {.key = "file", .get = [](const d& x) { return x.trace->file; }, .shown = in_data},
        {.key = "file", .label = "file", .get = [](const d& x) { return std::filesystem::path(x.trace->file).filename().string(); },
         .shown = in_table, .left = true},
        {"peaks", "", [](const d& x) { return to_records(resonance_peak_columns(), resonance_peak_rows(x.result)); }, {}, {}, in_json},
        {"peaks_V", "peaks [V]", [](const d& x) { return peak_list(found_peaks(x)); }, {}, {}, in_table},
        {"truth_peaks_V", "truth peaks [V]", [](const d& x) { return x.truth ? peak_list(x.truth->peaks_V) : "-"; }, {}, {}, in_table},
        {.key = "", .get = [](const d& x) { return cell(to_record(resonance_result_columns(), x.result)); }, .shown = in_json},
        {.key = "work_function_eV", .label = "W fit [eV]", .get = [](const d& x) { return x.result.work_function_J; },
         .scale = to_eV, .number = fixed(3), .shown = in_table,
         .spread = [](const d& x) { return x.result.work_function_stderr_J / J_per_eV; }},
        {"work_function_formula_eV", "W formula [eV]", [](const d& x) { return x.result.work_function_formula_J; }, to_eV, fixed(3),
         in_table},
        {.key = "truth_work_function_eV", .label = "truth W [eV]",
         .get = [no](const d& x) { return x.truth ? cell(x.truth->sample_work_function_J) : no(); }, .scale = to_eV,
         .number = fixed(3), .shown = in_table, .none = "-"},
        {.key = "work_function_within_ci", .label = "W in 95% CI",
         .get = [no](const d& x) { return x.truth ? cell(x.work_function_within) : no(); }, .none = "-"},
        {"truth", "", [no](const d& x) { return x.truth ? cell(resonance_truth_record(x)) : no(); }, {}, {}, in_json},
        {"largest_peak_error_V", "", [no](const d& x) { return x.truth ? cell(x.largest_peak_error_V) : no(); }, {}, {}, in_json},
    };
    return columns;
}

std::string demo_resonance_plot_name(const demo_resonance& d) {
    return fmt::format("resonance-{}.png", std::filesystem::path(d.trace->file).stem().string());
}

record demo_document(const demo_report& r, const std::string& out_dir) {
    record j;
    j.set("command", "demo");
    j.set("synthetic_data", true);
    j.set("config", config_record(r.cfg));
    j.set("prediction", to_records(demo_prediction_columns(), r.sweep));
    j.set("plan", to_records(demo_plan_columns(), r.plan));
    cell::list curves;
    for (const demo_curve& d : r.curves) {
        record c = to_record(demo_curve_columns(), d);
        c.set("plot", (std::filesystem::path(out_dir) / demo_plot_name(d)).string());
        curves.emplace_back(std::move(c));
    }
    j.set("curves", std::move(curves));
    const demo_tally t = tally(r);
    record summary;
    summary.set("curves_compared", t.compared);
    summary.set("kappa_within_ci", t.kappa_within);
    summary.set("offsets_compared", t.offsets_compared);
    summary.set("offset_within_ci", t.offset_within);
    j.set("summary", summary);
    cell::list resonances;
    for (const demo_resonance& d : r.resonances) {
        record c = to_record(demo_resonance_columns(), d);
        c.set("plot", (std::filesystem::path(out_dir) / demo_resonance_plot_name(d)).string());
        resonances.emplace_back(std::move(c));
    }
    j.set("resonances", std::move(resonances));
    return j;
}

}  // namespace tipgap
