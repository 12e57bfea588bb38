// tipgap predict: the forward model at one point, a sweep or a (gap, bias) grid.
#include <fmt/format.h>
#include <memory>

#include "commands.hpp"
#include "output.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/figures/figures.hpp"
#include "tipgap/plot/plot.hpp"
#include "tipgap/plan/predict.hpp"
#include "tipgap/plan/sweep.hpp"
#include "tipgap/plan/uncertainty.hpp"

namespace tipgap::cli {
namespace {

struct predict_args {
    std::string config_path, gap, bias, output, plot_path;
    int points = 11;
    int threads = 0;
    output_format format = output_format::table;
    uncertainty_options uncertainty;
};

nlohmann::json point_json(const prediction& p) {
    const double eV = si::electron_volt;
    const auto& q = p.q;
    double kappa_nm = q.decay_constant_per_m * 1e-9;
    return {{"gap_nm", q.gap_m * 1e9},
            {"bias_V", q.bias_V},
            {"temperature_K", q.temperature_K},
            {"current_density_A_per_m2", q.current_density_A_per_m2},
            {"current_A", p.current_A},
            {"conductance_S", p.conductance_S},
            {"conductance_G0", p.conductance_G0},
            {"differential_conductance_density_S_per_m2", q.differential_conductance_density_S_per_m2},
            {"dlnI_dV_per_V", q.dlnI_dV_per_V},
            {"decay_constant_per_nm", kappa_nm},
            {"nm_per_decade", kappa_nm > 0 ? std::log(10.0) / (2.0 * kappa_nm) : 0.0},
            {"apparent_barrier_eV", q.apparent_barrier_J / eV},
            {"barrier_top_eV", q.barrier_top_J / eV},
            {"barrier_width_nm", q.barrier_width_m * 1e9},
            {"regime", to_string(q.kind)},
            {"warnings", p.warnings}};
}

void run(const predict_args& a) {
    config c = load_config_or_default(a.config_path);
    if (!a.plot_path.empty()) plot::format_from_path(a.plot_path);  // a bad extension fails before the work
    a.uncertainty.validate();
    auto gaps = parse_sweep(a.gap, dimension::length, a.points, spacing::linear, "--gap");
    auto biases = parse_sweep(a.bias, dimension::voltage, a.points, spacing::linear, "--bias");
    // Two ranges of up to 1e6 points each would ask for 1e12 points: refuse before allocating.
    constexpr std::size_t max_points = 10'000'000;
    if (gaps.size() * biases.size() > max_points) {
        throw_usage("--points", fmt::format("the grid has {} x {} = {} points; expected at most {} in one run",
                                            gaps.size(), biases.size(), gaps.size() * biases.size(), max_points));
    }
    std::vector<std::pair<double, double>> pts;
    for (double V : biases)
        for (double s : gaps) {
            validate_operating_point(c.model, s, V, "--gap", "--bias");
            pts.emplace_back(s, V);
        }
    auto results = predict_points(c, pts, a.threads);

    // Uncertainty per point, when the config gives any.
    std::vector<uncertainty_summary> u(results.size());
    const bool with_u = c.sigma.any();
    if (with_u) {
        uncertainty_options uo = a.uncertainty;
        uo.threads = a.threads;
        for (std::size_t i = 0; i < pts.size(); ++i) u[i] = predict_uncertainty(c, pts[i].first, pts[i].second, uo);
    }

    std::size_t shown = 0, warned = 0;
    for (const auto& r : results) {
        if (r.warnings.empty()) continue;
        ++warned;
        if (shown++ < 3) print_warnings(r.warnings, fmt::format("gap {:.4g} nm, bias {:.4g} V", r.q.gap_m * 1e9, r.q.bias_V));
    }
    if (warned > 3) fmt::print(stderr, "tipgap: warning: ... and {} more points with warnings (see the output)\n", warned - 3);

    std::string text;
    if (a.format == output_format::json) {
        nlohmann::json j;
        j["command"] = "predict";
        j["config"] = config_json(c);
        j["points"] = nlohmann::json::array();
        for (std::size_t i = 0; i < results.size(); ++i) {
            auto pj = point_json(results[i]);
            add_uncertainty_json(pj, u[i]);
            j["points"].push_back(pj);
        }
        if (with_u && !u.empty() && !u.front().inputs.empty()) j["uncertainty"] = uncertainty_info_json(u.front());
        text = j.dump(2) + "\n";
    } else if (a.format == output_format::csv) {
        std::vector<std::string> head{"gap_nm", "bias_V", "temperature_K", "current_density_A_per_m2", "current_A",
                                      "conductance_S", "conductance_G0", "decay_constant_per_nm", "nm_per_decade",
                                      "apparent_barrier_eV", "barrier_top_eV", "barrier_width_nm", "regime"};
        const bool u_cols = with_u && !u.empty() && !u.front().inputs.empty();
        if (u_cols)
            for (const auto& n : u.front().names)
                for (const char* suffix : {"_stddev", "_ci95_low", "_ci95_high", "_linear_stddev"})
                    head.push_back(n + suffix);
        text = csv_line(head);
        for (std::size_t i = 0; i < results.size(); ++i) {
            auto j = point_json(results[i]);
            std::vector<std::string> row{full_precision(j["gap_nm"]), full_precision(j["bias_V"]), full_precision(j["temperature_K"]),
                                         full_precision(j["current_density_A_per_m2"]), full_precision(j["current_A"]),
                                         full_precision(j["conductance_S"]), full_precision(j["conductance_G0"]),
                                         full_precision(j["decay_constant_per_nm"]), full_precision(j["nm_per_decade"]),
                                         full_precision(j["apparent_barrier_eV"]), full_precision(j["barrier_top_eV"]),
                                         full_precision(j["barrier_width_nm"]), j["regime"].get<std::string>()};
            if (u_cols)
                for (const auto& v : u[i].values)
                    for (double x : {v.mc_stddev, v.ci95_low, v.ci95_high, v.linear_stddev}) row.push_back(full_precision(x));
            text += csv_line(row);
        }
    } else {
        text_table t;
        t.headers = {"gap [nm]", "bias [V]", "J [A/m²]", "I [A]", "G [G0]", "κ [1/nm]", "nm/decade", "φ_ap [eV]",
                     "top [eV]", "regime"};
        for (std::size_t i = 0; i < results.size(); ++i) {
            auto j = point_json(results[i]);
            // Uncertainty of the current (output 0 of predict_uncertainty), Monte Carlo when drawn.
            double sd = std::numeric_limits<double>::quiet_NaN();
            if (with_u && !u[i].inputs.empty())
                sd = u[i].samples > 0 ? u[i].values[0].mc_stddev : u[i].values[0].linear_stddev;
            t.rows.push_back({rounded(j["gap_nm"]), rounded(j["bias_V"]), rounded(j["current_density_A_per_m2"]),
                              rounded_pm(j["current_A"], sd), rounded(j["conductance_G0"]),
                              rounded(j["decay_constant_per_nm"]), rounded(j["nm_per_decade"]),
                              rounded(j["apparent_barrier_eV"]), rounded(j["barrier_top_eV"]),
                              j["regime"].get<std::string>()});
        }
        text = fmt::format("# {} · T = {} K · image {} · method {} · geometry {}\n", c.source, c.model.temperature_K,
                           to_string(c.model.image), to_string(c.model.method), to_string(c.geometry.kind)) +
               (with_u && !u.empty() && !u.front().inputs.empty()
                    ? (u.front().samples > 0
                           ? fmt::format("# ± : Monte Carlo standard uncertainty of I, {} draws, seed {} (inputs: {})\n",
                                         u.front().samples, u.front().seed, fmt::join(u.front().inputs, ", "))
                           : fmt::format("# ± : linear propagation (inputs: {})\n", fmt::join(u.front().inputs, ", ")))
                    : std::string()) +
               t.render();
    }
    write_output(a.output, text);
    if (!a.plot_path.empty()) plot::write_figure(predict_figure(c, gaps, biases, results, a.threads), a.plot_path);
}

}  // namespace

void add_predict(CLI::App& app) {
    auto a = std::make_shared<predict_args>();
    auto* cmd = app.add_subcommand("predict", "Predict current, conductance, decay constant and apparent barrier "
                                              "height at given gaps and biases");
    cmd->add_option("--config,-c", a->config_path, "Junction configuration (YAML); default: the built-in one");
    cmd->add_option("--gap", a->gap, "Gap: one value (0.6nm), a list (0.5nm,0.6nm) or a range FROM..TO")->required();
    cmd->add_option("--bias", a->bias, "Sample bias: one value (0.1V, -0.5V), a list or a range FROM..TO")->required();
    cmd->add_option("--points", a->points, "Points per range (default 11)")->check(CLI::Range(2, 1000000));
    cmd->add_option("--threads", a->threads, "Worker threads (default: all cores)")->check(CLI::Range(0, 256));
    cmd->add_option("--plot", a->plot_path, "Also write a figure: FILE.png, FILE.svg or FILE.pdf");
    add_uncertainty_options(cmd, a->uncertainty);
    add_output_options(cmd, a->format, a->output);
    cmd->callback([a] { run(*a); });
}

}  // namespace tipgap::cli
