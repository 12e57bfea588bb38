#include "output.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <fmt/format.h>

#include "tipgap/io/atomic_file.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/core/constants.hpp"

namespace tipgap::cli {

CLI::Option* add_format_option(CLI::App* cmd, output_format& format) {
    return cmd
        ->add_option_function<std::string>(
            "--format",
            [&format](const std::string& s) {
                if (!from_string(s, format)) throw CLI::ValidationError("--format", quote_input(s) + " is not an output format; expected " + accepted_names<output_format>());
            },
            "Output format: table (rounded, for reading), csv or json (full precision)")
        ->type_name("table|csv|json");
}

void add_output_options(CLI::App* cmd, output_format& format, std::string& output_path) {
    add_format_option(cmd, format);
    cmd->add_option("--output,-o", output_path, "Write the result to FILE (atomically) instead of standard output");
}

void write_output(const std::string& path, std::string_view content) {
    if (path.empty() || path == "-") {
        std::fwrite(content.data(), 1, content.size(), stdout);
        std::fflush(stdout);
        return;
    }
    write_file_atomically(path, content);
}

std::string csv_cell(std::string_view s) {
    if (s.find_first_of(",\"\n\r") == std::string_view::npos) return std::string(s);
    std::string out = "\"";
    for (char c : s) {
        if (c == '"') out += '"';
        out += c;
    }
    out += '"';
    return out;
}

std::string text_table::render() const {
    std::vector<std::size_t> width(headers.size(), 0);
    auto cells = [](const std::string& s) {
        // Display width: count UTF-8 lead bytes only.
        std::size_t n = 0;
        for (unsigned char c : s) n += (c & 0xC0) != 0x80;
        return n;
    };
    for (std::size_t i = 0; i < headers.size(); ++i) width[i] = cells(headers[i]);
    for (const auto& r : rows)
        for (std::size_t i = 0; i < r.size() && i < width.size(); ++i) width[i] = std::max(width[i], cells(r[i]));
    auto line = [&](const std::vector<std::string>& r) {
        std::string out;
        for (std::size_t i = 0; i < r.size(); ++i) {
            std::size_t pad = width[i] > cells(r[i]) ? width[i] - cells(r[i]) : 0;
            if (i) out += "  ";
            out += std::string(pad, ' ') + r[i];
        }
        return out + "\n";
    };
    std::string out = line(headers);
    std::size_t total = 0;
    for (auto w : width) total += w + 2;
    out += std::string(total > 2 ? total - 2 : 0, '-') + "\n";
    for (const auto& r : rows) out += line(r);
    return out;
}

std::string full_precision(double v) {
    if (std::isnan(v)) return "nan";
    return fmt::format("{:.17g}", v);
}

std::string rounded(double v, int digits) {
    if (std::isnan(v)) return "NaN";
    if (v == 0.0) return "0";
    double a = std::abs(v);
    if (a >= 1e-3 && a < 1e6) {
        int decimals = std::max(0, digits - 1 - static_cast<int>(std::floor(std::log10(a))));
        return fmt::format("{:.{}f}", v, decimals);
    }
    return fmt::format("{:.{}e}", v, digits - 1);
}

std::string csv_line(const std::vector<std::string>& cells) {
    std::string out;
    for (std::size_t i = 0; i < cells.size(); ++i) {
        if (i) out += ',';
        out += csv_cell(cells[i]);
    }
    return out + "\n";
}

tipgap::config load_config_or_default(const std::string& path) {
    return path.empty() ? tipgap::default_config() : tipgap::load_config(path);
}

nlohmann::json config_json(const tipgap::config& c) {
    const double eV = tipgap::si::electron_volt;
    nlohmann::json j;
    j["source"] = c.source;
    auto electrode = [&](const tipgap::electrode& e, double sigma) {
        nlohmann::json x{{"material", e.material},
                         {"work_function_eV", e.work_function_J / eV},
                         {"fermi_energy_eV", e.fermi_energy_J / eV}};
        if (sigma > 0) x["work_function_stddev_eV"] = sigma / eV;
        return x;
    };
    j["tip"] = electrode(c.model.tip, c.sigma.tip_work_function_J);
    j["sample"] = electrode(c.model.sample, c.sigma.sample_work_function_J);
    j["image_potential"] = to_string(c.model.image);
    j["relative_permittivity"] = c.model.relative_permittivity;
    j["temperature_K"] = c.model.temperature_K;
    j["method"] = to_string(c.model.method);
    j["tolerance"] = c.model.rel_tol;
    nlohmann::json g{{"kind", to_string(c.geometry.kind)}};
    if (c.geometry.kind == tipgap::geometry_kind::planar) g["area_nm2"] = c.geometry.area_m2 * 1e18;
    if (c.geometry.kind == tipgap::geometry_kind::paraboloid) g["apex_radius_nm"] = c.geometry.apex_radius_m * 1e9;
    if (c.geometry.kind == tipgap::geometry_kind::contact_anchored)
        g["contact_distance_nm"] = c.geometry.contact_distance_m * 1e9;
    j["geometry"] = g;
    return j;
}

void add_uncertainty_json(nlohmann::json& j, const tipgap::uncertainty_summary& u) {
    if (u.inputs.empty()) return;
    for (std::size_t k = 0; k < u.names.size(); ++k) {
        const auto& v = u.values[k];
        const std::string& n = u.names[k];
        if (u.samples > 0) {
            j[n + "_stddev"] = v.mc_stddev;
            j[n + "_ci95"] = {v.ci95_low, v.ci95_high};
            j[n + "_mc_mean"] = v.mc_mean;
        }
        if (!std::isnan(v.linear_stddev) || !std::isnan(v.linear_ci95_low)) {
            j[n + "_linear_stddev"] = v.linear_stddev;
            j[n + "_linear_ci95"] = {v.linear_ci95_low, v.linear_ci95_high};
        }
    }
}

nlohmann::json uncertainty_info_json(const tipgap::uncertainty_summary& u) {
    nlohmann::json j;
    j["inputs"] = u.inputs;
    j["monte_carlo_samples"] = u.samples;
    j["seed"] = u.seed;
    j["redrawn"] = u.redrawn;
    j["failed"] = u.failed;
    j["coverage"] = "95 % interval: Monte Carlo 2.5 % and 97.5 % quantiles; linear: value ± 1.96 u";
    return j;
}

std::string rounded_pm(double value, double u, int digits) {
    if (std::isnan(u)) return rounded(value, digits);
    return rounded(value, digits) + " ± " + rounded(u, 2);
}

void add_uncertainty_options(CLI::App* cmd, tipgap::uncertainty_options& o) {
    cmd->add_option("--mc-samples", o.samples,
                    "Monte Carlo draws for the config's input uncertainties (default 400; 0: linear propagation only)")
        ->check(CLI::Range(0, 1000000));
    cmd->add_option("--seed", o.seed, "Seed of the Monte Carlo draws (default 1); the same seed gives the same result");
}

void print_warnings(const std::vector<std::string>& warnings, const std::string& context) {
    for (const auto& w : warnings) {
        if (context.empty()) {
            fmt::print(stderr, "tipgap: warning: {}\n", w);
        } else {
            fmt::print(stderr, "tipgap: warning: {}: {}\n", context, w);
        }
    }
}

}  // namespace tipgap::cli
