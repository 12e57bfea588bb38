// tipgap table: a quick-reference table of decay rates for the config's tip against sample materials.
#include <fmt/format.h>
#include <memory>

#include "commands.hpp"
#include "output.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/plan/reference_table.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap::cli {
namespace {

struct table_args {
    std::string config_path, samples, current = "1nA", bias = "0.1V", output;
    int threads = 0;
    output_format format = output_format::table;
};

std::vector<std::string> split_names(const std::string& s) {
    std::vector<std::string> out;
    std::size_t start = 0;
    while (start <= s.size() && !s.empty()) {
        std::size_t comma = s.find(',', start);
        std::string item = s.substr(start, comma == std::string::npos ? std::string::npos : comma - start);
        while (!item.empty() && item.front() == ' ') item.erase(item.begin());
        while (!item.empty() && item.back() == ' ') item.pop_back();
        if (!item.empty()) out.push_back(item);
        if (comma == std::string::npos) break;
        start = comma + 1;
    }
    return out;
}

nlohmann::json row_json(const reference_row& r) {
    const double eV = si::electron_volt;
    return {{"sample", r.sample},
            {"sample_work_function_eV", r.sample_work_function_J / eV},
            {"mean_barrier_eV", r.mean_barrier_J / eV},
            {"decay_constant_per_nm", r.decay_constant_per_m * 1e-9},
            {"nm_per_decade", r.nm_per_decade},
            {"de_broglie_wavelength_nm", r.de_broglie_wavelength_m * 1e9},
            {"gap_nm", r.gap_m * 1e9},
            {"apparent_barrier_eV", r.apparent_barrier_J / eV},
            {"model_nm_per_decade", r.model_nm_per_decade},
            {"warnings", r.warnings}};
}

void run(const table_args& a) {
    config c = load_config_or_default(a.config_path);
    location wi, wv;
    wi.key = "--current";
    wv.key = "--bias";
    const double I = parse_quantity(a.current, dimension::current, wi);
    const double V = parse_quantity(a.bias, dimension::voltage, wv);
    location ws;
    ws.key = "--samples";
    std::vector<std::string> names = split_names(a.samples);
    std::vector<reference_row> rows;
    try {
        rows = reference_table(c, names, I, V, {}, a.threads);
    } catch (const error& e) {
        if (e.where().key == "current" || e.where().key == "bias" || e.where().key == "samples") {
            location w;
            w.key = "--" + e.where().key;
            throw error(e.kind(), w, e.detail());
        }
        throw;
    }
    for (const auto& r : rows) print_warnings(r.warnings, r.sample);

    const std::string tip = c.model.tip.material.empty() ? "custom" : c.model.tip.material;
    std::string text;
    if (a.format == output_format::json) {
        nlohmann::json j;
        j["command"] = "table";
        j["config"] = config_json(c);
        j["reference_setpoint"] = {{"current_A", I}, {"bias_V", V}};
        j["rows"] = nlohmann::json::array();
        for (const auto& r : rows) j["rows"].push_back(row_json(r));
        text = j.dump(2) + "\n";
    } else if (a.format == output_format::csv) {
        text = csv_line({"sample", "sample_work_function_eV", "mean_barrier_eV", "decay_constant_per_nm",
                         "nm_per_decade", "de_broglie_wavelength_nm", "gap_nm", "apparent_barrier_eV",
                         "model_nm_per_decade"});
        for (const auto& r : rows) {
            auto j = row_json(r);
            auto num = [&](const char* k) { return j[k].is_null() ? std::string("NaN") : full_precision(j[k].get<double>()); };
            text += csv_line({r.sample, num("sample_work_function_eV"), num("mean_barrier_eV"),
                              num("decay_constant_per_nm"), num("nm_per_decade"), num("de_broglie_wavelength_nm"),
                              num("gap_nm"), num("apparent_barrier_eV"), num("model_nm_per_decade")});
        }
    } else {
        text_table t;
        t.headers = {"sample", "φ_s [eV]", "φ̄ [eV]", "κ [1/nm]", "nm/decade", "λ_dB [nm]", "gap [nm]", "φ_ap [eV]",
                     "model nm/decade"};
        for (const auto& r : rows) {
            auto j = row_json(r);
            auto num = [&](const char* k) { return j[k].is_null() ? std::string("NaN") : rounded(j[k].get<double>()); };
            t.rows.push_back({r.sample, num("sample_work_function_eV"), num("mean_barrier_eV"),
                              num("decay_constant_per_nm"), num("nm_per_decade"), num("de_broglie_wavelength_nm"),
                              num("gap_nm"), num("apparent_barrier_eV"), num("model_nm_per_decade")});
        }
        text = fmt::format("# {} tip (φ_t = {:.3g} eV) · {} geometry · reference setpoint {:g} A at {:g} V\n"
                           "# φ̄, κ = √(2mφ̄)/ħ, nm/decade = ln10/(2κ) and λ_dB = h/√(2mφ̄): rectangular barrier of "
                           "the mean work function\n"
                           "# gap, φ_ap and model nm/decade: the full model at the reference setpoint\n",
                           tip, c.model.tip.work_function_J / si::electron_volt, to_string(c.geometry.kind), I, V) +
               t.render();
    }
    write_output(a.output, text);
}

}  // namespace

void add_table(CLI::App& app) {
    auto a = std::make_shared<table_args>();
    auto* cmd = app.add_subcommand("table", "Quick-reference table: barrier, decay constant, nm per decade, apparent "
                                            "barrier and gap at a reference setpoint, for sample materials");
    cmd->add_option("--config,-c", a->config_path, "Junction configuration (YAML); its tip is used");
    cmd->add_option("--samples", a->samples,
                    "Sample materials from the library, comma-separated (gold,graphite); default: all");
    cmd->add_option("--current", a->current, "Reference setpoint current (default 1nA)");
    cmd->add_option("--bias", a->bias, "Reference setpoint bias (default 0.1V)");
    cmd->add_option("--threads", a->threads, "Worker threads (default: all cores)")->check(CLI::Range(0, 256));
    add_output_options(cmd, a->format, a->output);
    cmd->callback([a] { run(*a); });
}

}  // namespace tipgap::cli
