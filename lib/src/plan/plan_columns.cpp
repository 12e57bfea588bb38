#include "tipgap/plan/plan_columns.hpp"

#include "tipgap/core/constants.hpp"
#include "tipgap/plan/uncertainty_columns.hpp"

namespace tipgap {

std::vector<column<plan_row>> plan_columns(const std::vector<std::string>& uncertainty_names) {
    using r = plan_row;
    // Outputs 0, 1, 2 of plan_uncertainty: gap_nm, nm_per_decade, apparent_barrier_eV.
    auto u = [](std::size_t k) { return [k](const r& x) { return standard_uncertainty(*x.uncertainty, k); }; };
    // A number of the point, or null at 0 V (JSON null, CSV empty, table "—"): no gap holds a setpoint there.
    auto at_bias = [](double plan_point::*field) {
        return [field](const r& x) { return x.point->solution.status == solve_status::zero_bias ? cell() : cell(x.point->*field); };
    };
    std::vector<column<r>> out = {
        {.key = "bias_V", .label = "bias", .get = [](const r& x) { return x.point->bias_V; }, .reading_unit = "V"},
        {.key = "current_A", .label = "I", .get = [](const r& x) { return x.point->signed_setpoint_A(); }, .reading_unit = "A"},
        {.key = "gap_nm", .label = "gap [nm]", .get = [](const r& x) { return x.point->solution.status == solve_status::zero_bias ? cell() : cell(x.point->solution.gap_m); },
         .scale = times(1e9), .spread = u(0), .none = "—"},
        {.key = "dz_nm", .label = "Δz", .get = at_bias(&plan_point::dz_m), .scale = times(1e9), .none = "—", .reading_unit = "m"},
        {.key = "model_current_A", .get = [](const r& x) { return x.point->solution.current_A; }, .shown = in_json},
        {.key = "gap_resistance_ohm", .label = "R", .get = at_bias(&plan_point::gap_resistance_ohm), .none = "—", .reading_unit = "Ω"},
        {.key = "conductance_G0", .label = "G [G0]", .get = at_bias(&plan_point::conductance_G0), .none = "—"},
        {.key = "decay_constant_per_nm", .get = at_bias(&plan_point::decay_constant_per_m), .scale = times(1e-9), .shown = in_data},
        {.key = "nm_per_decade", .label = "nm/decade", .get = at_bias(&plan_point::nm_per_decade), .spread = u(1), .none = "—"},
        {.key = "apparent_barrier_eV", .label = "φ_ap [eV]", .get = at_bias(&plan_point::apparent_barrier_J),
         .scale = divided_by(si::electron_volt), .spread = u(2), .none = "—"},
        {.key = "regime", .get = [](const r& x) { return x.point->reachable() ? cell(to_string(x.point->kind)) : cell(); },
         .shown = in_data},
        {.key = "regime", .label = "regime",
         .get = [](const r& x) {
             if (x.point->solution.status == solve_status::zero_bias) return cell("zero bias");
             return x.point->reachable() ? cell(to_string(x.point->kind)) : cell();
         },
         .shown = in_table, .none = "unreachable"},
        {.key = "note", .get = [](const r& x) { return x.point->note.empty() ? cell(absent{}) : cell(x.point->note); }, .shown = in_json},
        {.key = "status", .get = [](const r& x) { return to_string(x.point->solution.status); }, .shown = in_data},
        {.key = "evaluations", .get = [](const r& x) { return x.point->evaluations; }, .shown = in_data},
        {.key = "warnings", .get = [](const r& x) { return x.point->warnings; }, .shown = in_json},
    };
    auto uc = part_columns<r>(uncertainty_columns(uncertainty_names), [](const r& x) -> const uncertainty_summary& { return *x.uncertainty; });
    out.insert(out.end(), uc.begin(), uc.end());
    return out;
}

}  // namespace tipgap
