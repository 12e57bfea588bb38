// tipgap demo: the main job on the built-in config. Runs the library's demo (predict, fit every
// curve of the synthetic demo_scans/ set, compare with the ground truth), prints a summary table
// and writes CSV, JSON and PNG figures into --out, each file atomically.
#include <chrono>
#include <filesystem>
#include <fmt/format.h>
#include <memory>
#include <string>
#include <system_error>
#include <vector>

#include "command.hpp"
#include "flags.hpp"
#include "output.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/demo/demo.hpp"
#include "tipgap/demo/demo_columns.hpp"
#include "tipgap/figures/demo_figures.hpp"
#include "tipgap/figures/fit_plot.hpp"
#include "tipgap/figures/resonance_plot.hpp"
#include "tipgap/io/atomic_directory.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap::cli {
namespace {

namespace fs = std::filesystem;

struct demo_args {
    std::string out = "tipgap-demo";
    std::string scans;  // empty: beside the executable
    int threads = 0;
    bool no_model = false;
};

// The demo scans beside the executable: <bin>/<TIPGAP_DEMO_SCANS_FROM_BIN> (the installed data
// directory; the build tree mirrors it), then <bin>/demo_scans. No path is compiled in.
std::string find_demo_scans() {
    std::error_code ec;
    const fs::path bin = fs::read_symlink("/proc/self/exe", ec).parent_path();
    std::vector<fs::path> tried;
    for (const fs::path& p : {bin / TIPGAP_DEMO_SCANS_FROM_BIN, bin / "demo_scans"}) {
        tried.push_back(p.lexically_normal());
        if (fs::is_directory(tried.back(), ec)) return tried.back().string();
    }
    throw_input(location{"", 0, 0, "--scans"},
                fmt::format("no demo scans beside the executable (looked in {} and {}); expected --scans DIR",
                            tried[0].string(), tried[1].string()));
}

// Everything into a hidden sibling directory that replaces --out in one rename at the end.
void write_report(const demo_report& r, const std::string& out) {
    std::vector<std::string> names{"prediction.csv", "fits.csv", "demo.json", "prediction.png"};
    for (const demo_curve& d : r.curves) names.push_back(demo_plot_name(d));
    for (const demo_resonance& d : r.resonances) names.push_back(demo_resonance_plot_name(d));
    atomic_directory out_dir(out, names);
    const fs::path dir(out_dir.temporary_path());
    write_output((dir / "prediction.csv").string(), format_csv(demo_prediction_columns(), r.sweep));
    write_output((dir / "fits.csv").string(), format_csv(demo_curve_columns(), r.curves));
    write_output((dir / "demo.json").string(), json_text(demo_document(r, out)));
    plot::write_figure(demo_prediction_figure(r), (dir / "prediction.png").string());
    for (const demo_curve& d : r.curves) {
        const std::string title = fmt::format("{} ({}), synthetic", fs::path(d.curve->file).filename().string(), to_string(d.fit.direction));
        plot::write_figure(make_fit_figure(d.sweep(), d.fit, d.model ? &*d.model : nullptr, title), (dir / demo_plot_name(d)).string());
    }
    for (const demo_resonance& d : r.resonances) {
        const std::string title = fmt::format("{}, synthetic", fs::path(d.trace->file).filename().string());
        plot::write_figure(make_resonance_figure(*d.trace, d.result, title), (dir / demo_resonance_plot_name(d)).string());
    }
    out_dir.commit();
}

// The options a file in another layout was read with, as `tipgap fit` takes them.
void print_read_options(const demo_report& r) {
    const measured_curve* last = nullptr;
    for (const demo_curve& d : r.curves) {
        if (d.curve.get() == last) continue;
        last = d.curve.get();
        std::string flags;
        for (const auto& [key, value] : settings(d.read))
            flags += fmt::format(" {}{}{}", flag_for("fit", key), value.empty() ? "" : " ", value);
        const std::string name = fs::path(d.curve->file).filename().string();
        if (!flags.empty()) fmt::print("note: {} is in another layout, read as: tipgap fit {}{}\n", name, name, flags);
        if (d.fit.model == fit_model::offset)
            fmt::print("note: {} has an amplifier offset, fitted as: tipgap fit {} (the default offset model)\n", name, name);
    }
}

void print_summary(const demo_report& r, const demo_options& o) {
    constexpr double eV = si::electron_volt;
    const prediction& mid = r.sweep[r.sweep.size() / 2];
    fmt::print("tipgap demo: built-in config ({} tip {:.2f} eV, {} sample {:.2f} eV, {} K, image potential {})\n",
               r.cfg.model.tip.material, r.cfg.model.tip.work_function_J / eV, r.cfg.model.sample.material,
               r.cfg.model.sample.work_function_J / eV, r.cfg.model.temperature_K, to_string(r.cfg.model.image));
    fmt::print("prediction at {:.3g} V: {} gaps {:.2f}..{:.2f} nm; at {:.2f} nm I = {:.3g} A, kappa = {:.3f} 1/nm, "
               "phi_ap = {:.3f} eV\n",
               mid.q.bias_V, r.sweep.size(), r.sweep.front().q.gap_m * 1e9, r.sweep.back().q.gap_m * 1e9,
               mid.q.gap_m * 1e9, mid.current_A, mid.q.decay_constant_per_m * 1e-9, mid.q.apparent_barrier_J / eV);
    fmt::print("plan at {:.3g} V (setpoint ladder):", o.bias_V);
    for (const plan_point& p : r.plan) {
        if (p.reachable()) fmt::print("  {:.3g} A -> {:.3f} nm", p.setpoint_A, p.solution.gap_m * 1e9);
        else fmt::print("  {:.3g} A -> unreachable", p.setpoint_A);
    }
    fmt::print("\n");
    for (const plan_point& p : r.plan) print_warnings(p.warnings, fmt::format("plan {:.3g} A", p.setpoint_A));
    fmt::print("\nfits of the synthetic curves in {} (as tipgap fit --model linear, or the model in the file's .fit.yaml; "
               "truth: the synthesiser's expected kappa, the weighted line of the noise-free curve, without the baseline "
               "for the offset model; no model comparison for offset-model fits, as it fits no offset):\n",
               o.scans_dir);
    fmt::print("{}", format_table(demo_curve_columns(), r.curves));
    const demo_tally t = tally(r);
    fmt::print("kappa inside its 95% interval for {} of {} sweeps. The fitted mean work function W is above phi_ap: "
               "the image potential lowers the apparent barrier.\n",
               t.kappa_within, t.compared);
    if (t.offsets_compared > 0)
        fmt::print("offset inside its 95% interval for {} of {} offset-model fits.\n", t.offset_within, t.offsets_compared);
    if (!r.resonances.empty())
        fmt::print("\nfield-emission resonances of the synthetic z(V) traces (sample work function from the peaks; the "
                   "triangular-well formula ignores the image potential and reads low):\n{}",
                   format_table(demo_resonance_columns(), r.resonances));
    for (const std::string& f : r.files_without_truth) fmt::print("note: {} has no truth file\n", f);
    print_read_options(r);
}

void run(const demo_args& a) {
    const auto t0 = std::chrono::steady_clock::now();
    demo_options o;
    o.scans_dir = a.scans.empty() ? find_demo_scans() : a.scans;
    o.threads = a.threads;
    o.model_comparison = !a.no_model;
    const demo_report r = run_demo(o);
    write_report(r, a.out);
    print_summary(r, o);
    const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    fmt::print("wrote {}/{{prediction.csv, fits.csv, demo.json, prediction.png, fit-*.png{}}} in {:.1f} s\n", a.out,
               r.resonances.empty() ? "" : ", resonance-*.png", seconds);
}

}  // namespace

command demo_command() {
    auto a = std::make_shared<demo_args>();
    command cmd{"demo", "The main job on the built-in config: predict, fit the synthetic demo curves, compare with their "
                        "truth, write a report"};
    cmd.flags = {
        {"--out", "Report directory (default ./tipgap-demo)", &a->out, "DIR"},
        {"--scans", "Curve directory (default: the demo_scans installed beside the executable)", &a->scans, "DIR"},
        {"--threads", "Worker threads (default: all cores)", &a->threads, "", false, std::pair{0, 256}},
        {"--no-model", "Skip the model comparison (mean work function fit)", &a->no_model},
    };
    cmd.run = [a](const std::string&) { run(*a); };
    return cmd;
}

}  // namespace tipgap::cli
