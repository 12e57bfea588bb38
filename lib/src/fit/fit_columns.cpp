#include "tipgap/fit/fit_columns.hpp"

#include <cmath>
#include <fmt/format.h>

#include "tipgap/core/constants.hpp"

namespace tipgap {

namespace {
// How `fit` has always converted: metres divided by 1e-9, per metre times 1e-9, joules divided by e.
constexpr scaling to_nm = divided_by(1e-9), to_per_nm = times(1e-9), to_eV = divided_by(si::electron_volt);
}  // namespace

const std::vector<column<contact_result>>& contact_columns() {
    using c = contact_result;
    auto if_any = [](const c& x, double v) { return x.kind == contact_kind::none ? std::nan("") : v; };
    static const std::vector<column<c>> columns = {
        {"kind", "", [](const c& x) { return to_string(x.kind); }},
        {"z_nm", "", [if_any](const c& x) { return if_any(x, x.z_m); }, to_nm},
        {"conductance_G0", "", [if_any](const c& x) { return if_any(x, x.conductance_G0); }},
        {"gap_offset_nm", "", [if_any](const c& x) { return if_any(x, x.gap_offset_m); }, to_nm},
        {"points_in_contact", "", [](const c& x) { return x.points_in_contact; }},
    };
    return columns;
}

const std::vector<column<profile_point>>& profile_columns() {
    using p = profile_point;
    static const std::vector<column<p>> columns = {
        {"z_nm", "", [](const p& x) { return x.z_m; }, to_nm},
        {"gap_nm", "", [](const p& x) { return x.gap_m; }, to_nm},
        {"decay_constant_per_nm", "", [](const p& x) { return x.decay_constant_per_m; }, to_per_nm},
        {"decay_constant_stderr_per_nm", "", [](const p& x) { return x.decay_constant_stderr_per_m; }, to_per_nm},
        {"apparent_barrier_eV", "", [](const p& x) { return x.apparent_barrier_J; }, to_eV},
        {"apparent_barrier_stderr_eV", "", [](const p& x) { return x.apparent_barrier_stderr_J; }, to_eV},
        {"points", "", [](const p& x) { return x.points; }},
    };
    return columns;
}

const std::vector<column<model_fit_result>>& model_fit_columns() {
    using m = model_fit_result;
    constexpr table_number d3 = fixed(3);
    // Uncertainties to 2 significant digits: a fixed 3 decimals printed "0.000" (issue 10).
    constexpr table_number s2 = {number_style::significant, 2};
    static const std::vector<column<m>> columns = {
        {"status", "", [](const m& x) { return to_string(x.status); }},
        // The values' spreads make format_line print "value ± error" rounded to the error.
        {"mean_work_function_eV", "", [](const m& x) { return x.mean_work_function_J; }, to_eV, d3, everywhere,
         [](const m& x) { return x.mean_work_function_stderr_J / si::electron_volt; }},
        {"mean_work_function_stderr_eV", "", [](const m& x) { return x.mean_work_function_stderr_J; }, to_eV, s2},
        {"tip_work_function_eV", "", [](const m& x) { return x.tip_work_function_J; }, to_eV, d3},
        {"sample_work_function_eV", "", [](const m& x) { return x.sample_work_function_J; }, to_eV, d3},
        {"gap_offset_nm", "", [](const m& x) { return x.gap_offset_m; }, to_nm, d3, everywhere,
         [](const m& x) { return x.gap_offset_stderr_m * 1e9; }},
        {"gap_offset_stderr_nm", "", [](const m& x) { return x.gap_offset_stderr_m; }, to_nm, s2},
        {"ln_prefactor", "", [](const m& x) { return x.ln_prefactor; }, {}, d3, everywhere,
         [](const m& x) { return x.ln_prefactor_stderr; }},
        {"ln_prefactor_stderr", "", [](const m& x) { return x.ln_prefactor_stderr; }, {}, s2},
        {"correlation_work_function_gap", "", [](const m& x) { return x.correlation_work_function_gap; }, {}, d3},
        {"gap_min_nm", "", [](const m& x) { return x.gap_min_m; }, to_nm, d3},
        {"gap_max_nm", "", [](const m& x) { return x.gap_max_m; }, to_nm, d3},
        {"model_apparent_barrier_eV", "", [](const m& x) { return x.model_apparent_barrier_J; }, to_eV, d3},
        {"apparent_barrier_eV", "", [](const m& x) { return x.data_apparent_barrier_J; }, to_eV, d3},
        {"work_function_minus_apparent_barrier_eV", "",
         [](const m& x) { return x.work_function_above_apparent_barrier_J(); }, to_eV, d3},
        {"residual_rms_ln", "", [](const m& x) { return x.residual_rms_ln; }, {}, d3},
        {"points_used", "", [](const m& x) { return x.points_used; }},
        {"iterations", "", [](const m& x) { return x.iterations; }},
        {"model_evaluations", "", [](const m& x) { return x.model_evaluations; }},
        {"warnings", "", [](const m& x) { return x.warnings; }},
    };
    return columns;
}

namespace {

using f = fitted_sweep;

// The statistics of the fit: kappa, phi_ap, their errors and intervals, nm per decade, R^2.
std::vector<column<f>> slope_columns() {
    std::vector<column<f>> out = {
        // Table: "value ± error", the error to 2 significant digits and the value rounded to match.
        {"decay_constant_per_nm", "kappa [1/nm]", [](const f& x) { return x.result.decay_constant_per_m; }, to_per_nm, fixed(3), everywhere,
         [](const f& x) { return x.result.decay_constant_stderr_per_m * 1e-9; }, "", 17},
        {"decay_constant_stderr_per_nm", "", [](const f& x) { return x.result.decay_constant_stderr_per_m; }, to_per_nm, {}, in_data},
        {"decay_constant_stat_stderr_per_nm", "", [](const f& x) { return x.result.decay_constant_stat_stderr_per_m; }, to_per_nm, {}, in_json},
        {"decay_constant_ci_low_per_nm", "", [](const f& x) { return x.result.decay_constant_ci_low_per_m; }, to_per_nm, {}, in_data},
        {"decay_constant_ci_high_per_nm", "", [](const f& x) { return x.result.decay_constant_ci_high_per_m; }, to_per_nm, {}, in_data},
        {"apparent_barrier_eV", "phi_ap [eV]", [](const f& x) { return x.result.apparent_barrier_J; }, to_eV, fixed(3), everywhere,
         [](const f& x) { return x.result.apparent_barrier_stderr_J / si::electron_volt; }, "", 16},
        {"apparent_barrier_stderr_eV", "", [](const f& x) { return x.result.apparent_barrier_stderr_J; }, to_eV, {}, in_data},
        {"apparent_barrier_ci", "95% CI [eV]",
         [](const f& x) {
             const double eV = si::electron_volt;
             return interval_text(x.result.apparent_barrier_ci_low_J / eV, x.result.apparent_barrier_ci_high_J / eV);
         },
         {}, {}, in_table, nullptr, "", 15},
        {"apparent_barrier_ci_low_eV", "", [](const f& x) { return x.result.apparent_barrier_ci_low_J; }, to_eV, {}, in_data},
        {"apparent_barrier_ci_high_eV", "", [](const f& x) { return x.result.apparent_barrier_ci_high_J; }, to_eV, {}, in_data},
        {"confidence_level", "", [](const f& x) { return x.result.confidence_level; }, {}, {}, in_json},
        {"t_quantile", "", [](const f& x) { return x.result.t_quantile; }, {}, {}, in_json},
        {"degrees_of_freedom", "", [](const f& x) { return x.result.degrees_of_freedom; }, {}, {}, in_json},
        {"calibration_uncertainty", "", [](const f& x) { return x.result.calibration_uncertainty; }, {}, {}, in_json},
        {"nm_per_decade", "nm/decade", [](const f& x) { return x.result.length_per_decade_m; }, to_nm, fixed(4), everywhere, nullptr, "", 9},
        {"prefactor_A", "", [](const f& x) { return x.result.prefactor_A; }, {}, {}, in_data},
        {"prefactor_stderr_A", "", [](const f& x) { return x.result.prefactor_stderr_A; }, {}, {}, in_json},
        {"z_ref_nm", "", [](const f& x) { return x.result.z_ref_m; }, to_nm, {}, in_json},
        {"offset_A", "", [](const f& x) { return x.result.offset_A; }, {}, {}, in_data},
        {"offset_stderr_A", "", [](const f& x) { return x.result.offset_stderr_A; }, {}, {}, in_data},
        // The linear model estimates no offset: "-" in the table.
        {"offset_A", "offset [pA]", [](const f& x) { return x.result.model == fit_model::linear ? cell(absent{}) : cell(x.result.offset_A); }, times(1e12), fixed(2), in_table,
         [](const f& x) { return x.result.offset_stderr_A * 1e12; }, "-", 13},
        {"r_squared", "R^2", [](const f& x) { return x.result.r_squared; }, {}, fixed(5), everywhere, nullptr, "", 8},
        {"reduced_chi_square", "chi2/dof", [](const f& x) { return x.result.reduced_chi_square; }, {}, fixed(2), everywhere, nullptr, "", 9},
        {"relative_noise", "", [](const f& x) { return x.result.relative_noise; }, {}, {}, in_data},
        {"curvature_p_value", "", [](const f& x) { return x.result.curvature_p_value; }, {}, {}, in_data},
        {"residual_rms_ln", "", [](const f& x) { return x.result.residual_rms_ln; }, {}, {}, in_data},
        {"residual_rms_A", "", [](const f& x) { return x.result.residual_rms_A; }, {}, {}, in_data},
    };
    return out;
}

// Which points were used, and the noise, saturation and contact that decided it.
std::vector<column<f>> selection_columns() {
    auto if_contact = [](const f& x, double v) { return x.result.contact.kind == contact_kind::none ? cell(absent{}) : cell(v); };
    std::vector<column<f>> out = {
        {"points", "points", [](const f& x) { return fmt::format("{}/{}", x.result.points_used, x.result.points_total); }, {}, {}, in_table, nullptr, "", 7},
        {"points_used", "", [](const f& x) { return x.result.points_used; }, {}, {}, in_data},
        {"points_total", "", [](const f& x) { return x.result.points_total; }, {}, {}, in_data},
        {"points_below_floor", "", [](const f& x) { return x.result.points_below_floor; }, {}, {}, in_json},
        {"points_saturated", "", [](const f& x) { return x.result.points_saturated; }, {}, {}, in_json},
        {"noise_floor_A", "", [](const f& x) { return x.result.noise_floor_A; }, {}, {}, in_data},
        {"noise_floor_estimated", "", [](const f& x) { return x.result.noise_floor_estimated; }, {}, {}, in_json},
        {"current_noise_A", "", [](const f& x) { return x.result.current_noise_A; }, {}, {}, in_data},
        {"current_noise_estimated", "", [](const f& x) { return x.result.current_noise_estimated; }, {}, {}, in_json},
        {"saturation_A", "", [](const f& x) { return x.result.saturation_A; }, {}, {}, in_data},
        {"saturation_detected", "", [](const f& x) { return x.result.saturation_detected; }, {}, {}, in_json},
        {"iterations", "", [](const f& x) { return x.result.iterations; }, {}, {}, in_json},
        {"contact", "", [](const f& x) { return cell(to_record(contact_columns(), x.result.contact)); }, {}, {}, in_json},
        {"contact", "", [](const f& x) { return to_string(x.result.contact.kind); }, {}, {}, in_csv},
        {"contact_z_nm", "", [if_contact](const f& x) { return if_contact(x, x.result.contact.z_m); }, to_nm, {}, in_csv},
        {"gap_offset_nm", "", [if_contact](const f& x) { return if_contact(x, x.result.contact.gap_offset_m); }, to_nm, {}, in_csv},
    };
    return out;
}

// The profile, the file's metadata, the model comparison and the plot (JSON), the warnings.
std::vector<column<f>> detail_columns() {
    std::vector<column<f>> out = {
        {"profile", "", [](const f& x) { return to_records(profile_columns(), x.result.profile); }, {}, {}, in_json},
        {"metadata", "",
         [](const f& x) {
             record r;
             for (const auto& [k, v] : x.curve->metadata.entries) r.set(k, v);
             return cell(r);
         },
         {}, {}, in_json},
        {"model_fit", "", [](const f& x) { return x.model ? cell(to_record(model_fit_columns(), *x.model)) : cell(absent{}); }, {}, {}, in_json},
        {"plot", "", [](const f& x) { return x.plot_path.empty() ? cell(absent{}) : cell(x.plot_path); }, {}, {}, in_json},
        {"warnings", "", [](const f& x) { return x.result.warnings; }, {}, {}, in_data},
    };
    return out;
}

}  // namespace

std::vector<column<f>> fitted_sweep_columns(bool with_model) {
    std::vector<column<f>> out = {
        {.key = "file", .label = "file", .get = [](const f& x) { return x.curve->file; }, .left = true},
        {.key = "direction", .label = "sweep", .get = [](const f& x) { return to_string(x.result.direction); }, .width = 8, .left = true},
        {.key = "model", .label = "model", .get = [](const f& x) { return to_string(x.result.model); }, .width = 6, .left = true},
        {.key = "status", .get = [](const f& x) { return to_string(x.result.status); }, .shown = in_data},
        {.key = "message", .get = [](const f& x) { return x.result.message; }, .shown = in_json},
    };
    for (auto part : {slope_columns(), selection_columns(), detail_columns()}) out.insert(out.end(), part.begin(), part.end());
    if (with_model) {
        auto model = select_columns(model_fit_columns(), {"mean_work_function_eV", "mean_work_function_stderr_eV", "gap_offset_nm",
                                                          "gap_offset_stderr_nm", "ln_prefactor", "model_apparent_barrier_eV", "status"});
        for (auto& c : model) {
            if (!c.key.starts_with("model_")) c.key = "model_" + c.key;
            c.shown = in_csv;
        }
        // Every sweep has a comparison when one was asked for.
        auto csv = part_columns<f>(model, [](const f& x) -> const model_fit_result& { return *x.model; });
        out.insert(out.end(), csv.begin(), csv.end());
    }
    return out;
}

}  // namespace tipgap
