// The teaching table: textbook rectangular-barrier numbers and the model at a reference setpoint.
#include "tipgap/plan/reference_table.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <fmt/ranges.h>

#include "core/detail/parallel.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/plan/predict.hpp"

namespace tipgap {

std::vector<reference_row> reference_table(const config& c, const std::vector<std::string>& samples,
                                           double current_A, double bias_V, const plan_options& options,
                                           int threads) {
    std::vector<material_entry> materials;
    if (samples.empty()) {
        materials = all_materials();
    } else {
        for (const auto& name : samples) {
            location w;
            w.key = "samples";
            materials.push_back(find_material(name, w));
        }
    }
    std::vector<reference_row> rows(materials.size());
    detail::parallel_for(materials.size(), threads, [&](std::size_t i) {
        const material_entry& m = materials[i];
        reference_row& r = rows[i];
        r.sample = m.name;
        r.sample_work_function_J = m.work_function_J;
        // Rectangular barrier of the mean height: D ~ exp(-2 kappa s), kappa = sqrt(2 m phi)/hbar
        // (the textbook WKB decay of a rectangular barrier; from memory).
        r.mean_barrier_J = 0.5 * (c.model.tip.work_function_J + m.work_function_J);
        r.decay_constant_per_m = std::sqrt(2.0 * si::electron_mass * r.mean_barrier_J) / si::hbar;
        r.nm_per_decade = std::log(10.0) / (2.0 * r.decay_constant_per_m) * 1e9;
        // de Broglie: lambda = h / p with p = sqrt(2 m E), E = phi.
        r.de_broglie_wavelength_m = si::planck_h / std::sqrt(2.0 * si::electron_mass * r.mean_barrier_J);
        config x = c;
        x.model.sample.material = m.name;
        x.model.sample.work_function_J = m.work_function_J;
        x.model.sample.fermi_energy_J = m.fermi_energy_J;
        const plan_point p = plan_setpoint(x, current_A, bias_V, options);
        r.gap_m = p.solution.gap_m;
        r.apparent_barrier_J = p.apparent_barrier_J;
        r.model_nm_per_decade = p.nm_per_decade;
        r.warnings = p.warnings;
    });
    std::vector<std::string> unreachable;
    for (const reference_row& r : rows)
        if (!std::isfinite(r.gap_m)) unreachable.push_back(r.sample);
    if (!unreachable.empty()) {
        location w;
        w.key = "current";
        const auto& first = *std::find_if(rows.begin(), rows.end(), [](const auto& r) { return !std::isfinite(r.gap_m); });
        throw error(error_kind::no_answer, w,
                    fmt::format("the reference setpoint {:g} A at {:g} V cannot be reached for {}{}{}", current_A, bias_V,
                                fmt::join(unreachable.begin(), unreachable.begin() + std::min<std::size_t>(unreachable.size(), 4), ", "),
                                unreachable.size() > 4 ? fmt::format(" and {} more", unreachable.size() - 4) : "",
                                first.warnings.empty() ? "" : "; " + first.warnings.front()));
    }
    return rows;
}

}  // namespace tipgap
