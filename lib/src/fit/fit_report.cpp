#include "tipgap/fit/fit_report.hpp"

#include <fmt/format.h>

#include "tipgap/fit/fit_columns.hpp"

namespace tipgap {

std::string model_comparison_text(const std::vector<fitted_sweep>& all) {
    std::string out;
    for (const fitted_sweep& f : all) {
        if (!f.model) continue;
        out += fmt::format("  {} ({}): ", f.curve->file, to_string(f.result.direction)) +
               format_line(model_fit_columns(), *f.model,
                           "mean work function {mean_work_function_eV} eV, gap = z + {gap_offset_nm} nm (gaps "
                           "{gap_min_nm}..{gap_max_nm} nm), ln prefactor {ln_prefactor}, {status}\n"
                           "    phi_ap {apparent_barrier_eV} eV is {work_function_minus_apparent_barrier_eV} eV below "
                           "the mean work function: the image potential lowers and rounds the barrier, so the apparent "
                           "barrier height is lower than the mean work function (the fitted model itself gives phi_ap "
                           "{model_apparent_barrier_eV} eV over these gaps)\n");
        for (const std::string& w : f.model->warnings) out += fmt::format("    warning: {}\n", w);
    }
    if (out.empty()) return out;
    return "model comparison (tunnelling model with image potential; free: mean work function, gap offset, ln "
           "prefactor):\n" + out;
}

std::string fit_notes_text(const std::vector<fitted_sweep>& all) {
    std::string out;
    for (const fitted_sweep& f : all)
        for (const std::string& w : f.result.warnings) out += fmt::format("  {} ({}): {}\n", f.curve->file, to_string(f.result.direction), w);
    // The header says 95 %; say so when another level was asked for.
    if (!all.empty() && all.front().result.confidence_level != 0.95)
        out += fmt::format("  intervals are at {:.3g} % confidence\n", 100.0 * all.front().result.confidence_level);
    for (const fitted_sweep& f : all)
        if (!f.plot_path.empty()) out += fmt::format("  plot of {} ({}): {}\n", f.curve->file, to_string(f.result.direction), f.plot_path);
    return out.empty() ? out : "notes:\n" + out;
}

}  // namespace tipgap
