#include "tipgap/demo/demo_text.hpp"

#include <filesystem>
#include <fmt/format.h>

#include "tipgap/core/constants.hpp"
#include "tipgap/demo/demo_columns.hpp"
#include "tipgap/figures/demo_figures.hpp"
#include "tipgap/figures/fit_plot.hpp"
#include "tipgap/figures/resonance_plot.hpp"
#include "tipgap/io/atomic_directory.hpp"
#include "tipgap/io/atomic_file.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap {

namespace fs = std::filesystem;

std::string demo_overview_text(const demo_report& r, const demo_options& o) {
    constexpr double eV = si::electron_volt;
    const prediction& mid = r.sweep[r.sweep.size() / 2];
    std::string s = fmt::format(
        "tipgap demo: built-in config ({} tip {:.2f} eV, {} sample {:.2f} eV, {} K, image potential {})\n",
        r.cfg.model.tip.material, r.cfg.model.tip.work_function_J / eV, r.cfg.model.sample.material,
        r.cfg.model.sample.work_function_J / eV, r.cfg.model.temperature_K, to_string(r.cfg.model.image));
    s += fmt::format("prediction at {:.3g} V: {} gaps {:.2f}..{:.2f} nm; at {:.2f} nm I = {:.3g} A, kappa = {:.3f} 1/nm, "
                     "phi_ap = {:.3f} eV\n",
                     mid.q.bias_V, r.sweep.size(), r.sweep.front().q.gap_m * 1e9, r.sweep.back().q.gap_m * 1e9,
                     mid.q.gap_m * 1e9, mid.current_A, mid.q.decay_constant_per_m * 1e-9, mid.q.apparent_barrier_J / eV);
    s += fmt::format("plan at {:.3g} V (setpoint ladder):", o.bias_V);
    for (const plan_point& p : r.plan) {
        if (p.reachable()) s += fmt::format("  {:.3g} A -> {:.3f} nm", p.setpoint_A, p.solution.gap_m * 1e9);
        else s += fmt::format("  {:.3g} A -> unreachable", p.setpoint_A);
    }
    return s + "\n";
}

std::string demo_results_text(const demo_report& r, const demo_options& o) {
    std::string s = fmt::format("\nfits of the synthetic curves in {} (as tipgap fit --model linear, or the model in the file's "
                                ".fit.yaml; truth: the synthesiser's expected kappa, the weighted line of the noise-free "
                                "curve, without the baseline for the offset model; no model comparison for offset-model "
                                "fits, as it fits no offset):\n",
                                o.scans_dir);
    s += format_table(demo_curve_columns(), r.curves);
    const demo_tally t = tally(r);
    s += fmt::format("kappa inside its 95% interval for {} of {} sweeps. The fitted mean work function W is above phi_ap: "
                     "the image potential lowers the apparent barrier.\n",
                     t.kappa_within, t.compared);
    if (t.offsets_compared > 0)
        s += fmt::format("offset inside its 95% interval for {} of {} offset-model fits.\n", t.offset_within, t.offsets_compared);
    if (!r.resonances.empty())
        s += fmt::format("\nfield-emission resonances of the synthetic z(V) traces (sample work function from the peaks; the "
                         "triangular-well formula ignores the image potential and reads low):\n{}",
                         format_table(demo_resonance_columns(), r.resonances));
    for (const std::string& f : r.files_without_truth) s += fmt::format("note: {} has no truth file\n", f);
    return s;
}

void write_demo_directory(const demo_report& r, const std::string& out) {
    std::vector<std::string> names{"prediction.csv", "fits.csv", "demo.json", "prediction.png"};
    for (const demo_curve& d : r.curves) names.push_back(demo_plot_name(d));
    for (const demo_resonance& d : r.resonances) names.push_back(demo_resonance_plot_name(d));
    atomic_directory out_dir(out, names);
    write_file_atomically(out_dir.file("prediction.csv"), format_csv(demo_prediction_columns(), r.sweep));
    write_file_atomically(out_dir.file("fits.csv"), format_csv(demo_curve_columns(), r.curves));
    write_file_atomically(out_dir.file("demo.json"), json_text(demo_document(r, out)));
    plot::write_figure(demo_prediction_figure(r), out_dir.file("prediction.png"));
    for (const demo_curve& d : r.curves) {
        const std::string title =
            fmt::format("{} ({}), synthetic", fs::path(d.curve->file).filename().string(), to_string(d.fit.direction));
        plot::write_figure(make_fit_figure(d.sweep(), d.fit, d.model ? &*d.model : nullptr, title),
                           out_dir.file(demo_plot_name(d)));
    }
    for (const demo_resonance& d : r.resonances) {
        const std::string title = fmt::format("{}, synthetic", fs::path(d.trace->file).filename().string());
        plot::write_figure(make_resonance_figure(*d.trace, d.result, title), out_dir.file(demo_resonance_plot_name(d)));
    }
    out_dir.commit();
}

}  // namespace tipgap
