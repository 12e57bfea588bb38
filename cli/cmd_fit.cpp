// tipgap fit: decay constant and apparent barrier height of measured I(z) curves. Parses flags
// into tipgap::fit_options, calls the library per file and formats the results.
#include <cmath>
#include <fmt/format.h>
#include <memory>
#include <optional>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "commands.hpp"
#include "fit_flags.hpp"
#include "output.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/figures/fit_plot.hpp"
#include "tipgap/fit/model_fit.hpp"
#include "tipgap/plot/plot.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap::cli {
namespace {

constexpr double per_nm = 1e-9;  // 1/m -> 1/nm multiplies by 1e-9

struct fit_args {
    std::vector<std::string> files;
    fit_flags flags;
    output_format format = output_format::table;
    std::string output;
    std::string plot;         // --plot FILE: one figure per fitted sweep
    std::string config_path;  // --config FILE: model comparison
};

struct fitted {
    const measured_curve* curve;
    const curve_sweep* sweep;
    fit_result result;
    std::optional<model_fit_result> model;  // with --config
    std::string plot_path;                  // with --plot
};

double nm(double m) { return m / 1e-9; }
double ev(double j) { return j / si::electron_volt; }
double nan_if_none(const contact_result& c, double v) {
    return c.kind == contact_kind::none ? std::nan("") : v;
}

nlohmann::ordered_json to_json(const fitted& f) {
    const fit_result& r = f.result;
    nlohmann::ordered_json j;
    j["file"] = f.curve->file;
    j["direction"] = to_string(r.direction);
    j["model"] = to_string(r.model);
    j["status"] = to_string(r.status);
    j["message"] = r.message;
    j["decay_constant_per_nm"] = r.decay_constant_per_m * per_nm;
    j["decay_constant_stderr_per_nm"] = r.decay_constant_stderr_per_m * per_nm;
    j["decay_constant_stat_stderr_per_nm"] = r.decay_constant_stat_stderr_per_m * per_nm;
    j["decay_constant_ci_low_per_nm"] = r.decay_constant_ci_low_per_m * per_nm;
    j["decay_constant_ci_high_per_nm"] = r.decay_constant_ci_high_per_m * per_nm;
    j["apparent_barrier_eV"] = ev(r.apparent_barrier_J);
    j["apparent_barrier_stderr_eV"] = ev(r.apparent_barrier_stderr_J);
    j["apparent_barrier_ci_low_eV"] = ev(r.apparent_barrier_ci_low_J);
    j["apparent_barrier_ci_high_eV"] = ev(r.apparent_barrier_ci_high_J);
    j["confidence_level"] = r.confidence_level;
    j["t_quantile"] = r.t_quantile;
    j["degrees_of_freedom"] = r.degrees_of_freedom;
    j["calibration_uncertainty"] = r.calibration_uncertainty;
    j["nm_per_decade"] = nm(r.length_per_decade_m);
    j["prefactor_A"] = r.prefactor_A;
    j["prefactor_stderr_A"] = r.prefactor_stderr_A;
    j["z_ref_nm"] = nm(r.z_ref_m);
    j["offset_A"] = r.offset_A;
    j["offset_stderr_A"] = r.offset_stderr_A;
    j["r_squared"] = r.r_squared;
    j["residual_rms_ln"] = r.residual_rms_ln;
    j["residual_rms_A"] = r.residual_rms_A;
    j["points_used"] = r.points_used;
    j["points_total"] = r.points_total;
    j["points_below_floor"] = r.points_below_floor;
    j["points_saturated"] = r.points_saturated;
    j["noise_floor_A"] = r.noise_floor_A;
    j["noise_floor_estimated"] = r.noise_floor_estimated;
    j["current_noise_A"] = r.current_noise_A;
    j["current_noise_estimated"] = r.current_noise_estimated;
    j["saturation_A"] = r.saturation_A;
    j["saturation_detected"] = r.saturation_detected;
    j["iterations"] = r.iterations;
    j["contact"] = {{"kind", to_string(r.contact.kind)},
                    {"z_nm", nan_if_none(r.contact, nm(r.contact.z_m))},
                    {"conductance_G0", nan_if_none(r.contact, r.contact.conductance_G0)},
                    {"gap_offset_nm", nan_if_none(r.contact, nm(r.contact.gap_offset_m))},
                    {"points_in_contact", r.contact.points_in_contact}};
    nlohmann::ordered_json prof = nlohmann::ordered_json::array();
    for (const profile_point& p : r.profile) {
        prof.push_back({{"z_nm", nm(p.z_m)},
                        {"gap_nm", nm(p.gap_m)},
                        {"decay_constant_per_nm", p.decay_constant_per_m * per_nm},
                        {"decay_constant_stderr_per_nm", p.decay_constant_stderr_per_m * per_nm},
                        {"apparent_barrier_eV", ev(p.apparent_barrier_J)},
                        {"apparent_barrier_stderr_eV", ev(p.apparent_barrier_stderr_J)},
                        {"points", p.points}});
    }
    j["profile"] = prof;
    nlohmann::ordered_json meta = nlohmann::ordered_json::object();
    for (const auto& [k, v] : f.curve->metadata.entries) meta[k] = v;
    j["metadata"] = meta;
    if (f.model) {
        const model_fit_result& m = *f.model;
        j["model_fit"] = {{"status", to_string(m.status)},
                          {"mean_work_function_eV", ev(m.mean_work_function_J)},
                          {"mean_work_function_stderr_eV", ev(m.mean_work_function_stderr_J)},
                          {"tip_work_function_eV", ev(m.tip_work_function_J)},
                          {"sample_work_function_eV", ev(m.sample_work_function_J)},
                          {"gap_offset_nm", nm(m.gap_offset_m)},
                          {"gap_offset_stderr_nm", nm(m.gap_offset_stderr_m)},
                          {"ln_prefactor", m.ln_prefactor},
                          {"ln_prefactor_stderr", m.ln_prefactor_stderr},
                          {"correlation_work_function_gap", m.correlation_work_function_gap},
                          {"gap_min_nm", nm(m.gap_min_m)},
                          {"gap_max_nm", nm(m.gap_max_m)},
                          {"model_apparent_barrier_eV", ev(m.model_apparent_barrier_J)},
                          {"apparent_barrier_eV", ev(m.data_apparent_barrier_J)},
                          {"work_function_minus_apparent_barrier_eV", ev(m.mean_work_function_J - m.data_apparent_barrier_J)},
                          {"residual_rms_ln", m.residual_rms_ln},
                          {"points_used", m.points_used},
                          {"iterations", m.iterations},
                          {"model_evaluations", m.model_evaluations},
                          {"warnings", m.warnings}};
    }
    if (!f.plot_path.empty()) j["plot"] = f.plot_path;
    j["warnings"] = r.warnings;
    return j;
}

std::string format_json(const std::vector<fitted>& all) {
    nlohmann::ordered_json curves = nlohmann::ordered_json::array();
    for (const fitted& f : all) curves.push_back(to_json(f));
    nlohmann::ordered_json doc;
    doc["curves"] = curves;
    return doc.dump(2) + "\n";
}

std::string format_csv(const std::vector<fitted>& all) {
    std::string out =
        "file,direction,model,status,decay_constant_per_nm,decay_constant_stderr_per_nm,decay_constant_ci_low_per_nm,"
        "decay_constant_ci_high_per_nm,apparent_barrier_eV,apparent_barrier_stderr_eV,apparent_barrier_ci_low_eV,"
        "apparent_barrier_ci_high_eV,nm_per_decade,prefactor_A,offset_A,offset_stderr_A,r_squared,residual_rms_ln,"
        "residual_rms_A,points_used,points_total,noise_floor_A,current_noise_A,saturation_A,contact,contact_z_nm,"
        "gap_offset_nm,warnings";
    const bool with_model = !all.empty() && all.front().model.has_value();
    if (with_model)
        out += ",model_mean_work_function_eV,model_mean_work_function_stderr_eV,model_gap_offset_nm,"
               "model_gap_offset_stderr_nm,model_ln_prefactor,model_apparent_barrier_eV,model_status";
    out += '\n';
    for (const fitted& f : all) {
        const fit_result& r = f.result;
        std::string warnings;
        for (const std::string& w : r.warnings) {
            if (!warnings.empty()) warnings += "; ";
            warnings += w;
        }
        const double values[] = {r.decay_constant_per_m * per_nm,
                                 r.decay_constant_stderr_per_m * per_nm,
                                 r.decay_constant_ci_low_per_m * per_nm,
                                 r.decay_constant_ci_high_per_m * per_nm,
                                 ev(r.apparent_barrier_J),
                                 ev(r.apparent_barrier_stderr_J),
                                 ev(r.apparent_barrier_ci_low_J),
                                 ev(r.apparent_barrier_ci_high_J),
                                 nm(r.length_per_decade_m),
                                 r.prefactor_A,
                                 r.offset_A,
                                 r.offset_stderr_A,
                                 r.r_squared,
                                 r.residual_rms_ln,
                                 r.residual_rms_A};
        out += fmt::format("{},{},{},{}", csv_cell(f.curve->file), to_string(r.direction), to_string(r.model),
                           to_string(r.status));
        for (double v : values) {
            out += ',';
            out += full_precision(v);
        }
        out += fmt::format(",{},{},{},{},{},{},{},{},{}\n", r.points_used, r.points_total, full_precision(r.noise_floor_A),
                           full_precision(r.current_noise_A), full_precision(r.saturation_A), to_string(r.contact.kind),
                           r.contact.kind == contact_kind::none ? "" : full_precision(nm(r.contact.z_m)),
                           r.contact.kind == contact_kind::none ? "" : full_precision(nm(r.contact.gap_offset_m)),
                           csv_cell(warnings));
        if (with_model) {
            out.pop_back();  // the newline
            const model_fit_result& m = *f.model;
            out += fmt::format(",{},{},{},{},{},{},{}\n", full_precision(ev(m.mean_work_function_J)),
                               full_precision(ev(m.mean_work_function_stderr_J)), full_precision(nm(m.gap_offset_m)),
                               full_precision(nm(m.gap_offset_stderr_m)), full_precision(m.ln_prefactor),
                               full_precision(ev(m.model_apparent_barrier_J)), to_string(m.status));
        }
    }
    return out;
}

std::string format_table(const std::vector<fitted>& all) {
    std::size_t file_w = 4;
    for (const fitted& f : all) file_w = std::max(file_w, f.curve->file.size());
    std::string out = fmt::format("{:<{}}  {:<8}  {:<6}  {:>12}  {:>7}  {:>11}  {:>6}  {:>15}  {:>9}  {:>8}  {:>7}\n",
                                  "file", file_w, "sweep", "model", "kappa [1/nm]", "+-", "phi_ap [eV]", "+-",
                                  "95% CI [eV]", "nm/decade", "R^2", "points");
    std::string notes;
    for (const fitted& f : all) {
        const fit_result& r = f.result;
        const std::string ci = fmt::format("{:.2f} - {:.2f}", ev(r.apparent_barrier_ci_low_J), ev(r.apparent_barrier_ci_high_J));
        out += fmt::format("{:<{}}  {:<8}  {:<6}  {:>12.3f}  {:>7.3f}  {:>11.3f}  {:>6.3f}  {:>15}  {:>9.4f}  {:>8.5f}  {:>7}\n",
                           f.curve->file, file_w, to_string(r.direction), to_string(r.model),
                           r.decay_constant_per_m * per_nm, r.decay_constant_stderr_per_m * per_nm,
                           ev(r.apparent_barrier_J), ev(r.apparent_barrier_stderr_J), ci, nm(r.length_per_decade_m),
                           r.r_squared, fmt::format("{}/{}", r.points_used, r.points_total));
        for (const std::string& w : r.warnings) notes += fmt::format("  {} ({}): {}\n", f.curve->file, to_string(r.direction), w);
    }
    if (all.size() > 0 && all.front().result.confidence_level != 0.95) {
        // The header says 95 %; say so when another level was asked for.
        notes += fmt::format("  intervals are at {:.3g} % confidence\n", 100.0 * all.front().result.confidence_level);
    }
    bool any_model = false;
    for (const fitted& f : all) any_model = any_model || f.model.has_value();
    if (any_model) {
        out += "model comparison (tunnelling model with image potential; free: mean work function, gap offset, "
               "ln prefactor):\n";
        for (const fitted& f : all) {
            if (!f.model) continue;
            const model_fit_result& m = *f.model;
            out += fmt::format(
                "  {} ({}): mean work function {:.3f} +- {:.3f} eV, gap = z + {:.3f} +- {:.3f} nm (gaps {:.3f}..{:.3f} nm), "
                "ln prefactor {:.3f} +- {:.3f}, {}\n",
                f.curve->file, to_string(f.result.direction), ev(m.mean_work_function_J), ev(m.mean_work_function_stderr_J),
                nm(m.gap_offset_m), nm(m.gap_offset_stderr_m), nm(m.gap_min_m), nm(m.gap_max_m), m.ln_prefactor,
                m.ln_prefactor_stderr, to_string(m.status));
            out += fmt::format(
                "    phi_ap {:.3f} eV is {:.3f} eV below the mean work function: the image potential lowers and rounds "
                "the barrier, so the apparent barrier height is lower than the mean work function (the fitted model "
                "itself gives phi_ap {:.3f} eV over these gaps)\n",
                ev(m.data_apparent_barrier_J), ev(m.mean_work_function_J - m.data_apparent_barrier_J),
                ev(m.model_apparent_barrier_J));
            for (const std::string& w : m.warnings) out += fmt::format("    warning: {}\n", w);
        }
    }
    for (const fitted& f : all) {
        if (!f.plot_path.empty()) notes += fmt::format("  plot of {} ({}): {}\n", f.curve->file, to_string(f.result.direction), f.plot_path);
    }
    if (!notes.empty()) out += "notes:\n" + notes;
    return out;
}

void run_fit(const fit_args& args) {
    const fit_options options = to_fit_options(args.flags);
    std::vector<std::unique_ptr<measured_curve>> curves;
    std::vector<fitted> all;
    std::optional<config> model_config;
    // "default" names the built-in config (configs/default.yaml), as used by the demo.
    if (!args.config_path.empty())
        model_config = args.config_path == "default" ? default_config() : load_config(args.config_path);
    // Read every plot format problem before the (slow) fits.
    if (!args.plot.empty()) (void)plot::format_from_path(args.plot);
    for (const std::string& file : args.files) {
        curves.push_back(std::make_unique<measured_curve>(read_curve_csv(file)));
        const measured_curve& curve = *curves.back();
        std::vector<fit_result> results = fit_curve(curve, options);
        for (std::size_t k = 0; k < results.size(); ++k) {
            fitted f{&curve, &curve.sweeps[k], std::move(results[k]), std::nullopt, ""};
            if (model_config) {
                const double bias = curve.metadata.bias_V ? *curve.metadata.bias_V : std::nan("");
                location where{curve.file, 0, 0, ""};
                fit_result linear;
                if (f.result.model != fit_model::linear) {
                    fit_options lo = options;
                    lo.model = fit_model::linear;
                    linear = fit_sweep(*f.sweep, bias, lo, where);
                }
                model_fit_options mo;
                mo.confidence_level = options.confidence_level;
                f.model = fit_model_to_sweep(*model_config, *f.sweep, f.result.model == fit_model::linear ? f.result : linear,
                                             bias, mo, where);
            }
            all.push_back(std::move(f));
        }
    }
    if (!args.plot.empty()) {
        for (std::size_t k = 0; k < all.size(); ++k) {
            fitted& f = all[k];
            f.plot_path = numbered_plot_path(args.plot, k, all.size());
            const std::string title = fmt::format("{} ({})", f.curve->file, to_string(f.result.direction));
            plot::write_figure(make_fit_figure(*f.sweep, f.result, f.model ? &*f.model : nullptr, title), f.plot_path);
        }
    }
    std::string text = args.format == output_format::json  ? format_json(all)
                       : args.format == output_format::csv ? format_csv(all)
                                                           : format_table(all);
    write_output(args.output, text);
}

}  // namespace

void add_fit(CLI::App& app) {
    auto args = std::make_shared<fit_args>();
    CLI::App* cmd = app.add_subcommand(
        "fit", "Decay constant and apparent barrier height from measured I(z) curves (one CSV file per curve)");
    cmd->add_option("files", args->files, "Curve files: '# key: value' metadata, header 'z [nm],current [nA]', rows")
        ->required()
        ->type_name("FILE...");
    add_fit_flags(cmd, args->flags, true);
    cmd->add_option("--plot", args->plot,
                    "Figure of each fitted sweep (PNG, SVG or PDF by extension): ln|I| with fit and band, residuals, "
                    "phi_ap(z); several sweeps go to FILE-1.png, FILE-2.png, ...")
        ->type_name("FILE");
    cmd->add_option("--config", args->config_path,
                    "Model comparison: fit the tunnelling model of this config (mean work function, gap offset, "
                    "prefactor) to each sweep; 'default' is the built-in config")
        ->type_name("FILE");
    add_format_option(cmd, args->format);
    cmd->add_option("--output", args->output, "Write the report to FILE (atomically) instead of stdout")
        ->type_name("FILE");
    cmd->callback([args]() { run_fit(*args); });
}

}  // namespace tipgap::cli
