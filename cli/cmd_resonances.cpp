// tipgap resonances: field-emission resonance peaks of a measured z(V) or dI/dV(V) trace and the
// sample's local work function from them. Parses flags into tipgap::resonance_options, calls the
// library and formats the result.
#include <fmt/format.h>
#include <memory>

#include "commands.hpp"
#include "output.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"
#include "tipgap/figures/resonance_plot.hpp"
#include "tipgap/fit/resonances.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap::cli {
namespace {

struct resonance_args {
    std::string file, config_path, smoothing, output, plot_path;
    bool formula_only = false;
    int threads = 0;
    output_format format = output_format::table;
};

double eV(double J) { return J / si::electron_volt; }

nlohmann::json to_json(const bias_trace& t, const config& c, const resonance_result& r) {
    nlohmann::json peaks = nlohmann::json::array();
    for (std::size_t k = 0; k < r.peaks.size(); ++k) {
        const auto& p = r.peaks[k];
        peaks.push_back({{"order", p.order},
                         {"bias_V", p.bias_V},
                         {"bias_stderr_V", p.bias_stderr_V},
                         {"modulation", p.modulation},
                         {"model_bias_V", k < r.model_peaks_V.size() ? nlohmann::json(r.model_peaks_V[k]) : nlohmann::json()}});
    }
    return {{"command", "resonances"},
            {"file", t.file},
            {"config", config_json(c)},
            {"trace", to_string(t.kind)},
            {"current_A", t.current_A ? nlohmann::json(*t.current_A) : nlohmann::json()},
            {"smoothing_width_V", r.smoothing_width_V},
            {"peaks", peaks},
            {"field_V_per_nm", r.field_V_per_m * 1e-9},
            {"work_function_eV", eV(r.work_function_J)},
            {"work_function_stderr_eV", eV(r.work_function_stderr_J)},
            {"work_function_ci_eV", {eV(r.work_function_ci_low_J), eV(r.work_function_ci_high_J)}},
            {"confidence_level", r.confidence_level},
            {"work_function_formula_eV", eV(r.work_function_formula_J)},
            {"work_function_formula_stderr_eV", eV(r.work_function_formula_stderr_J)},
            {"model_traces", r.model_traces},
            {"status", to_string(r.status)},
            {"message", r.message}};
}

std::string summary_lines(const resonance_result& r, const char* prefix) {
    std::string s;
    s += fmt::format("{}work function (exact-model fit): {} eV, {:g} % interval [{:.3f}, {:.3f}] eV ({} model traces)\n",
                     prefix, rounded_pm(eV(r.work_function_J), eV(r.work_function_stderr_J)), 100 * r.confidence_level,
                     eV(r.work_function_ci_low_J), eV(r.work_function_ci_high_J), r.model_traces);
    s += fmt::format("{}work function (triangular-well formula, field {:.3g} V/nm): {} eV\n", prefix,
                     r.field_V_per_m * 1e-9,
                     rounded_pm(eV(r.work_function_formula_J), eV(r.work_function_formula_stderr_J)));
    s += fmt::format("{}status: {}{}\n", prefix, to_string(r.status), r.message.empty() ? "" : " (" + r.message + ")");
    return s;
}

std::string to_csv(const resonance_result& r) {
    std::string s = summary_lines(r, "# ");
    s += csv_line({"order", "bias_V", "bias_stderr_V", "modulation", "model_bias_V"});
    for (std::size_t k = 0; k < r.peaks.size(); ++k) {
        const auto& p = r.peaks[k];
        s += csv_line({std::to_string(p.order), full_precision(p.bias_V), full_precision(p.bias_stderr_V),
                       full_precision(p.modulation),
                       k < r.model_peaks_V.size() ? full_precision(r.model_peaks_V[k]) : std::string("NaN")});
    }
    return s;
}

std::string to_table(const bias_trace& t, const resonance_result& r) {
    text_table tab;
    tab.headers = {"n", "bias [V]", "modulation", "model [V]"};
    for (std::size_t k = 0; k < r.peaks.size(); ++k) {
        const auto& p = r.peaks[k];
        tab.rows.push_back({std::to_string(p.order), rounded_pm(p.bias_V, p.bias_stderr_V), rounded(p.modulation, 3),
                            k < r.model_peaks_V.size() ? rounded(r.model_peaks_V[k]) : "-"});
    }
    return fmt::format("# {} · {} trace · {} points · smoothing {:g} V\n", t.file, to_string(t.kind), t.bias_V.size(),
                       r.smoothing_width_V) +
           tab.render() + summary_lines(r, "");
}

void run(const resonance_args& a) {
    const config c = load_config_or_default(a.config_path);
    if (!a.plot_path.empty()) plot::format_from_path(a.plot_path);  // a bad extension fails before the work
    resonance_options o;
    if (!a.smoothing.empty()) {
        try {
            o.smoothing_half_width_V = 0.5 * parse_quantity(a.smoothing, dimension::voltage);
        } catch (const error& e) {
            throw_usage("--smoothing", e.detail());
        }
    }
    o.model_fit = !a.formula_only;
    o.threads = a.threads;
    try {
        o.validate();
    } catch (const error& e) {
        throw_usage(e.where().key == "smoothing" ? "--smoothing" : "--" + e.where().key, e.detail());
    }
    const bias_trace t = read_bias_trace(a.file);
    const resonance_result r = analyse_resonances(c, t, o);
    const bool asked = r.status == resonance_status::formula_only && a.formula_only;
    if (r.status != resonance_status::ok && !asked) print_warnings({r.message}, a.file);
    const std::string text = a.format == output_format::json  ? to_json(t, c, r).dump(2) + "\n"
                             : a.format == output_format::csv ? to_csv(r)
                                                              : to_table(t, r);
    write_output(a.output, text);
    if (!a.plot_path.empty()) plot::write_figure(make_resonance_figure(t, r, a.file), a.plot_path);
}

}  // namespace

void add_resonances(CLI::App& app) {
    auto a = std::make_shared<resonance_args>();
    auto* cmd = app.add_subcommand("resonances", "Field-emission resonances of a z(V) or dI/dV(V) trace and the "
                                                 "sample's local work function from them");
    cmd->add_option("file", a->file, "Trace: '# current: 1 nA', header 'bias [V],z [nm]' (or 'bias [V],didv [nS]'), rows")
        ->required()
        ->type_name("FILE");
    cmd->add_option("--config,-c", a->config_path,
                    "Junction configuration (YAML); its sample work function is the one fitted; default: built-in");
    cmd->add_option("--smoothing", a->smoothing, "Full width of the smoothing window (default 0.6V)")->type_name("VOLTAGE");
    cmd->add_flag("--formula-only", a->formula_only, "Peaks and the triangular-well formula only (no model fit)");
    cmd->add_option("--threads", a->threads, "Worker threads for the model traces (default: all cores)")
        ->check(CLI::Range(0, 256));
    cmd->add_option("--plot", a->plot_path, "Also write a figure: FILE.png, FILE.svg or FILE.pdf");
    add_output_options(cmd, a->format, a->output);
    cmd->callback([a] { run(*a); });
}

}  // namespace tipgap::cli
