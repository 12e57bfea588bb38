#include "tipgap/plan/reference_table_columns.hpp"

#include <fmt/format.h>

#include "tipgap/core/constants.hpp"

namespace tipgap {

const std::vector<column<reference_row>>& reference_columns() {
    using r = reference_row;
    constexpr scaling to_eV = divided_by(si::electron_volt);
    static const std::vector<column<r>> columns = {
        {"sample", "sample", [](const r& x) { return x.sample; }},
        {"sample_work_function_eV", "φ_s [eV]", [](const r& x) { return x.sample_work_function_J; }, to_eV},
        {"mean_barrier_eV", "φ̄ [eV]", [](const r& x) { return x.mean_barrier_J; }, to_eV},
        {"decay_constant_per_nm", "κ [1/nm]", [](const r& x) { return x.decay_constant_per_m; }, times(1e-9)},
        {"nm_per_decade", "nm/decade", [](const r& x) { return x.nm_per_decade; }},
        {"de_broglie_wavelength_nm", "λ_dB [nm]", [](const r& x) { return x.de_broglie_wavelength_m; }, times(1e9)},
        {"gap_nm", "gap [nm]", [](const r& x) { return x.gap_m; }, times(1e9)},
        {"apparent_barrier_eV", "φ_ap [eV]", [](const r& x) { return x.apparent_barrier_J; }, to_eV},
        {"model_nm_per_decade", "model nm/decade", [](const r& x) { return x.model_nm_per_decade; }},
        {.key = "warnings", .get = [](const r& x) { return x.warnings; }, .shown = in_json},
    };
    return columns;
}

std::string reference_table_header(const config& c, double current_A, double bias_V) {
    const std::string tip = c.model.tip.material.empty() ? "custom" : c.model.tip.material;
    return fmt::format("# {} tip (φ_t = {:.3g} eV) · {} geometry · reference setpoint {:g} A at {:g} V\n"
                       "# φ̄, κ = √(2mφ̄)/ħ, nm/decade = ln10/(2κ) and λ_dB = h/√(2mφ̄): rectangular barrier of "
                       "the mean work function\n"
                       "# gap, φ_ap and model nm/decade: the full model at the reference setpoint\n",
                       tip, c.model.tip.work_function_J / si::electron_volt, to_string(c.geometry.kind), current_A, bias_V);
}

}  // namespace tipgap
