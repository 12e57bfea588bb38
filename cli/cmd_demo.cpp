// tipgap demo: the main job on the built-in config. Runs the library's demo (predict, fit every
// curve of the synthetic demo_scans/ set, compare with the ground truth), prints a summary table
// and writes CSV, JSON and PNG figures into --out, each file atomically.
#include <chrono>
#include <cmath>
#include <filesystem>
#include <fmt/format.h>
#include <memory>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "commands.hpp"
#include "demo_resonances.hpp"
#include "output.hpp"
#include "tipgap/io/atomic_directory.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/demo/demo.hpp"
#include "tipgap/figures/fit_plot.hpp"
#include "tipgap/plot/plot.hpp"

#ifndef TIPGAP_DEMO_SCANS
#define TIPGAP_DEMO_SCANS "demo_scans"
#endif

namespace tipgap::cli {
namespace {

constexpr double eV = si::electron_volt;

struct demo_args {
    std::string out = "tipgap-demo";
    std::string scans = TIPGAP_DEMO_SCANS;
    int threads = 0;
    bool no_model = false;
};

std::string fmt_or_dash(bool have, double v, const char* spec) {
    return have ? fmt::format(fmt::runtime(spec), v) : std::string("-");
}

std::string sweep_label(const demo_curve& d) {
    return to_string(d.fit.direction);
}

// fit-<stem>.png, or fit-<stem>-<direction>.png for a curve with several sweeps.
std::string plot_name(const demo_curve& d) {
    const std::string stem = std::filesystem::path(d.curve->file).stem().string();
    return d.curve->sweeps.size() > 1 ? fmt::format("fit-{}-{}.png", stem, to_string(d.fit.direction))
                                      : fmt::format("fit-{}.png", stem);
}

std::string summary_table(const demo_report& r) {
    text_table t;
    t.headers = {"file", "sweep", "kappa [1/nm]", "phi_ap [eV]", "truth kappa", "truth phi_ap", "kappa in 95% CI",
                 "model W [eV]", "truth W [eV]"};
    for (const demo_curve& d : r.curves) {
        const bool st = d.sweep_truth.has_value();
        t.rows.push_back(
            {std::filesystem::path(d.curve->file).filename().string(), sweep_label(d),
             fmt::format("{:.3f} ± {:.3f}", d.fit.decay_constant_per_m * 1e-9, d.fit.decay_constant_stderr_per_m * 1e-9),
             fmt::format("{:.3f} ± {:.3f}", d.fit.apparent_barrier_J / eV, d.fit.apparent_barrier_stderr_J / eV),
             fmt_or_dash(st, st ? d.sweep_truth->decay_constant_expected_per_m * 1e-9 : 0, "{:.3f}"),
             fmt_or_dash(st, st ? d.sweep_truth->apparent_barrier_expected_J / eV : 0, "{:.3f}"),
             st ? (d.kappa_within ? "yes" : "no") : "-",
             d.model ? fmt::format("{:.3f} ± {:.3f}", d.model->mean_work_function_J / eV,
                                   d.model->mean_work_function_stderr_J / eV)
                     : std::string("-"),
             fmt_or_dash(d.truth.has_value(), d.truth ? d.truth->mean_work_function_J / eV : 0, "{:.3f}")});
    }
    return t.render();
}

nlohmann::ordered_json report_json(const demo_report& r, const std::string& out_dir) {
    nlohmann::ordered_json j;
    j["command"] = "demo";
    j["synthetic_data"] = true;
    j["config"] = config_json(r.cfg);
    nlohmann::ordered_json pred = nlohmann::ordered_json::array();
    for (const prediction& p : r.sweep) {
        pred.push_back({{"gap_nm", p.q.gap_m * 1e9},
                        {"bias_V", p.q.bias_V},
                        {"current_A", p.current_A},
                        {"conductance_G0", p.conductance_G0},
                        {"decay_constant_per_nm", p.q.decay_constant_per_m * 1e-9},
                        {"apparent_barrier_eV", p.q.apparent_barrier_J / eV},
                        {"regime", to_string(p.q.kind)},
                        {"warnings", p.warnings}});
    }
    j["prediction"] = pred;
    nlohmann::ordered_json plan = nlohmann::ordered_json::array();
    for (const plan_point& p : r.plan) {
        plan.push_back({{"bias_V", p.bias_V},
                        {"current_A", p.setpoint_A},
                        {"gap_nm", p.reachable() ? nlohmann::ordered_json(p.solution.gap_m * 1e9) : nlohmann::ordered_json()},
                        {"conductance_G0", p.conductance_G0},
                        {"nm_per_decade", p.nm_per_decade},
                        {"apparent_barrier_eV", p.apparent_barrier_J / eV},
                        {"regime", to_string(p.kind)},
                        {"warnings", p.warnings}});
    }
    j["plan"] = plan;
    nlohmann::ordered_json curves = nlohmann::ordered_json::array();
    std::size_t within = 0, compared = 0;
    for (const demo_curve& d : r.curves) {
        const fit_result& f = d.fit;
        nlohmann::ordered_json c;
        c["file"] = d.curve->file;
        c["direction"] = to_string(f.direction);
        c["decay_constant_per_nm"] = f.decay_constant_per_m * 1e-9;
        c["decay_constant_stderr_per_nm"] = f.decay_constant_stderr_per_m * 1e-9;
        c["decay_constant_ci_low_per_nm"] = f.decay_constant_ci_low_per_m * 1e-9;
        c["decay_constant_ci_high_per_nm"] = f.decay_constant_ci_high_per_m * 1e-9;
        c["apparent_barrier_eV"] = f.apparent_barrier_J / eV;
        c["apparent_barrier_stderr_eV"] = f.apparent_barrier_stderr_J / eV;
        c["nm_per_decade"] = f.length_per_decade_m * 1e9;
        c["points_used"] = f.points_used;
        c["r_squared"] = f.r_squared;
        c["contact"] = to_string(f.contact.kind);
        c["saturation_detected"] = f.saturation_detected;
        c["warnings"] = f.warnings;
        if (d.sweep_truth) {
            ++compared;
            within += d.kappa_within ? 1 : 0;
            c["truth"] = {{"decay_constant_expected_per_nm", d.sweep_truth->decay_constant_expected_per_m * 1e-9},
                          {"decay_constant_model_per_nm", d.sweep_truth->decay_constant_model_per_m * 1e-9},
                          {"apparent_barrier_expected_eV", d.sweep_truth->apparent_barrier_expected_J / eV},
                          {"mean_work_function_eV", d.truth->mean_work_function_J / eV},
                          {"seed", d.truth->seed}};
            c["kappa_within_ci"] = d.kappa_within;
        }
        if (d.model) {
            c["model_fit"] = {{"status", to_string(d.model->status)},
                              {"mean_work_function_eV", d.model->mean_work_function_J / eV},
                              {"mean_work_function_stderr_eV", d.model->mean_work_function_stderr_J / eV},
                              {"gap_offset_nm", d.model->gap_offset_m * 1e9},
                              {"gap_offset_stderr_nm", d.model->gap_offset_stderr_m * 1e9},
                              {"model_apparent_barrier_eV", d.model->model_apparent_barrier_J / eV},
                              {"work_function_within_ci", d.work_function_within},
                              {"warnings", d.model->warnings}};
        }
        c["plot"] = (std::filesystem::path(out_dir) / plot_name(d)).string();
        curves.push_back(c);
    }
    j["curves"] = curves;
    j["summary"] = {{"curves_compared", compared}, {"kappa_within_ci", within}};
    j["resonances"] = resonance_json(r, out_dir);
    return j;
}

std::string fits_csv(const demo_report& r) {
    std::string out = csv_line({"file", "direction", "decay_constant_per_nm", "decay_constant_stderr_per_nm",
                                "apparent_barrier_eV", "apparent_barrier_stderr_eV", "truth_decay_constant_per_nm",
                                "kappa_within_ci", "model_mean_work_function_eV", "model_mean_work_function_stderr_eV",
                                "truth_mean_work_function_eV"});
    for (const demo_curve& d : r.curves) {
        out += csv_line({d.curve->file, to_string(d.fit.direction), full_precision(d.fit.decay_constant_per_m * 1e-9),
                         full_precision(d.fit.decay_constant_stderr_per_m * 1e-9), full_precision(d.fit.apparent_barrier_J / eV),
                         full_precision(d.fit.apparent_barrier_stderr_J / eV),
                         d.sweep_truth ? full_precision(d.sweep_truth->decay_constant_expected_per_m * 1e-9) : "",
                         d.sweep_truth ? (d.kappa_within ? "yes" : "no") : "",
                         d.model ? full_precision(d.model->mean_work_function_J / eV) : "",
                         d.model ? full_precision(d.model->mean_work_function_stderr_J / eV) : "",
                         d.truth ? full_precision(d.truth->mean_work_function_J / eV) : ""});
    }
    return out;
}

std::string prediction_csv(const demo_report& r) {
    std::string out = csv_line({"gap_nm", "bias_V", "current_A", "conductance_G0", "decay_constant_per_nm",
                                "apparent_barrier_eV", "regime"});
    for (const prediction& p : r.sweep) {
        out += csv_line({full_precision(p.q.gap_m * 1e9), full_precision(p.q.bias_V), full_precision(p.current_A),
                         full_precision(p.conductance_G0), full_precision(p.q.decay_constant_per_m * 1e-9),
                         full_precision(p.q.apparent_barrier_J / eV), to_string(p.q.kind)});
    }
    return out;
}

plot::figure prediction_figure(const demo_report& r) {
    plot::xy_panel cur;
    cur.title = fmt::format("predicted current, built-in config, {:.3g} V", r.sweep.front().q.bias_V);
    cur.x_axis.label = "gap [nm]";
    cur.y_axis.label = "|I| [A]";
    cur.y_axis.scale = plot::axis_scale::log10;
    plot::series s{{}, {}, "|I|", plot::draw_style::line_and_markers, 0};
    plot::xy_panel phi;
    phi.title = "apparent barrier height from the model";
    phi.x_axis.label = "gap [nm]";
    phi.y_axis.label = "φ_ap [eV]";
    plot::series p{{}, {}, "φ_ap = (ħ²/8m)(d ln|J|/ds)²", plot::draw_style::line_and_markers, 1};
    for (const prediction& q : r.sweep) {
        s.x.push_back(q.q.gap_m * 1e9);
        s.y.push_back(std::abs(q.current_A));
        p.x.push_back(q.q.gap_m * 1e9);
        p.y.push_back(q.q.apparent_barrier_J / eV);
    }
    cur.lines.push_back(s);
    phi.lines.push_back(p);
    const double mean = 0.5 * (r.cfg.model.tip.work_function_J + r.cfg.model.sample.work_function_J) / eV;
    phi.references.push_back({plot::orientation::horizontal, mean, "mean work function"});
    phi.legend = plot::legend_position::bottom_right;
    plot::figure f;
    f.title = "tipgap demo: prediction";
    f.panels = {cur, phi};
    f.columns = 1;
    f.panel_height = 420;
    return f;
}

void run(const demo_args& a) {
    const auto t0 = std::chrono::steady_clock::now();
    demo_options o;
    o.scans_dir = a.scans;
    o.threads = a.threads;
    o.model_comparison = !a.no_model;
    const demo_report r = run_demo(o);

    // The report appears whole or not at all: it is written into a hidden sibling directory that
    // replaces --out in one rename at the end (tipgap/atomic_file.hpp).
    namespace fs = std::filesystem;
    std::vector<std::string> names{"prediction.csv", "fits.csv", "demo.json", "prediction.png"};
    for (const demo_curve& d : r.curves) names.push_back(plot_name(d));
    for (const demo_resonance& d : r.resonances) names.push_back(resonance_plot_name(d));
    atomic_directory out_dir(a.out, names);
    const fs::path dir(out_dir.temporary_path());
    write_output((dir / "prediction.csv").string(), prediction_csv(r));
    write_output((dir / "fits.csv").string(), fits_csv(r));
    write_output((dir / "demo.json").string(), report_json(r, a.out).dump(2) + "\n");
    plot::write_figure(prediction_figure(r), (dir / "prediction.png").string());
    for (const demo_curve& d : r.curves) {
        const std::string title = fmt::format("{} ({}), synthetic", fs::path(d.curve->file).filename().string(),
                                              to_string(d.fit.direction));
        plot::write_figure(make_fit_figure(d.sweep(), d.fit, d.model ? &*d.model : nullptr, title),
                           (dir / plot_name(d)).string());
    }
    write_resonance_figures(r, dir);
    out_dir.commit();

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
        if (p.reachable()) {
            fmt::print("  {:.3g} A -> {:.3f} nm", p.setpoint_A, p.solution.gap_m * 1e9);
        } else {
            fmt::print("  {:.3g} A -> unreachable", p.setpoint_A);
        }
    }
    fmt::print("\n");
    for (const plan_point& p : r.plan) print_warnings(p.warnings, fmt::format("plan {:.3g} A", p.setpoint_A));
    fmt::print("\nfits of the synthetic curves in {} (truth: the synthesiser's expected kappa):\n", a.scans);
    fmt::print("{}", summary_table(r));
    std::size_t within = 0, compared = 0;
    for (const demo_curve& d : r.curves) {
        if (!d.sweep_truth) continue;
        ++compared;
        within += d.kappa_within ? 1 : 0;
    }
    fmt::print("kappa inside its 95% interval for {} of {} sweeps. The fitted mean work function W is above phi_ap: "
               "the image potential lowers the apparent barrier.\n",
               within, compared);
    fmt::print("{}", resonance_summary(r));
    for (const std::string& f : r.files_without_truth) fmt::print("note: {} has no truth file\n", f);
    const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    fmt::print("wrote {}/{{prediction.csv, fits.csv, demo.json, prediction.png, fit-*.png{}}} in {:.1f} s\n", a.out,
               r.resonances.empty() ? "" : ", resonance-*.png", seconds);
}

}  // namespace

void add_demo(CLI::App& app) {
    auto a = std::make_shared<demo_args>();
    CLI::App* cmd = app.add_subcommand(
        "demo", "The main job on the built-in config: predict, fit the synthetic demo curves, compare with their truth, "
                "write a report");
    cmd->add_option("--out", a->out, "Report directory (default ./tipgap-demo)")->type_name("DIR");
    cmd->add_option("--scans", a->scans, "Curve directory (default: the source tree's demo_scans/)")->type_name("DIR");
    cmd->add_option("--threads", a->threads, "Worker threads (default: all cores)")->check(CLI::Range(0, 256));
    cmd->add_flag("--no-model", a->no_model, "Skip the model comparison (mean work function fit)");
    cmd->callback([a]() { run(*a); });
}

}  // namespace tipgap::cli
