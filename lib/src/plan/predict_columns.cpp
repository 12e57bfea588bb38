#include "tipgap/plan/predict_columns.hpp"

#include "tipgap/core/constants.hpp"
#include "tipgap/plan/uncertainty_columns.hpp"

namespace tipgap {

const std::vector<column<prediction>>& prediction_columns() {
    using p = prediction;
    constexpr scaling to_nm = times(1e9), to_per_nm = times(1e-9), to_eV = divided_by(si::electron_volt);
    static const std::vector<column<p>> columns = {
        {"gap_nm", "gap [nm]", [](const p& x) { return x.q.gap_m; }, to_nm},
        {.key = "bias_V", .label = "bias", .get = [](const p& x) { return x.q.bias_V; }, .reading_unit = "V"},
        {.key = "temperature_K", .get = [](const p& x) { return x.q.temperature_K; }, .shown = in_data},
        {"current_density_A_per_m2", "J [A/m²]", [](const p& x) { return x.q.current_density_A_per_m2; }},
        {.key = "current_A", .label = "I", .get = [](const p& x) { return x.current_A; }, .reading_unit = "A"},
        {.key = "conductance_S", .get = [](const p& x) { return x.conductance_S; }, .shown = in_data},
        {"conductance_G0", "G [G0]", [](const p& x) { return x.conductance_G0; }},
        {.key = "differential_conductance_density_S_per_m2",
         .get = [](const p& x) { return x.q.differential_conductance_density_S_per_m2; },
         .shown = in_json},
        {.key = "dlnI_dV_per_V", .get = [](const p& x) { return x.q.dlnI_dV_per_V; }, .shown = in_json},
        {"decay_constant_per_nm", "κ [1/nm]", [](const p& x) { return x.q.decay_constant_per_m; }, to_per_nm},
        {"nm_per_decade", "nm/decade", [](const p& x) { return x.nm_per_decade; }},
        {"apparent_barrier_eV", "φ_ap [eV]", [](const p& x) { return x.q.apparent_barrier_J; }, to_eV},
        {"barrier_top_eV", "top [eV]", [](const p& x) { return x.q.barrier_top_J; }, to_eV},
        {.key = "barrier_width_nm", .get = [](const p& x) { return x.q.barrier_width_m; }, .scale = to_nm, .shown = in_data},
        {"regime", "regime", [](const p& x) { return to_string(x.q.kind); }},
        {.key = "warnings", .get = [](const p& x) { return x.warnings; }, .shown = in_json},
    };
    return columns;
}

std::vector<column<predict_row>> predict_columns(const std::vector<std::string>& uncertainty_names) {
    auto out = part_columns<predict_row>(prediction_columns(), [](const predict_row& r) -> const prediction& { return *r.point; });
    for (column<predict_row>& c : out) {
        // The current's uncertainty (output 0 of predict_uncertainty) beside it in the table.
        if (c.key == "current_A") c.spread = [](const predict_row& r) { return standard_uncertainty(*r.uncertainty, 0); };
    }
    auto u = part_columns<predict_row>(uncertainty_columns(uncertainty_names),
                                       [](const predict_row& r) -> const uncertainty_summary& { return *r.uncertainty; });
    out.insert(out.end(), u.begin(), u.end());
    return out;
}

}  // namespace tipgap
