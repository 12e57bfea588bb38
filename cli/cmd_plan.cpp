// tipgap plan: the gap for a current setpoint at a bias; bias ranges give the constant-current trace
// z(V), current lists or ranges give setpoint ladders.
#include <fmt/format.h>
#include <memory>

#include "commands.hpp"
#include "output.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/figures/figures.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plot/plot.hpp"
#include "tipgap/plan/sweep.hpp"
#include "tipgap/plan/uncertainty.hpp"

namespace tipgap::cli {
namespace {

struct plan_args {
    std::string config_path, current, bias, output, plot_path;
    int points = 11;
    int threads = 0;
    output_format format = output_format::table;
    uncertainty_options uncertainty;
};

nlohmann::json point_json(const plan_point& p) {
    const double eV = si::electron_volt;
    // The requested current carries the sign of the bias (the sign of a setpoint is not used).
    const double requested = std::copysign(std::abs(p.setpoint_A), p.bias_V);
    return {{"bias_V", p.bias_V},
            {"current_A", requested},
            {"gap_nm", p.solution.gap_m * 1e9},
            {"model_current_A", p.solution.current_A},
            {"gap_resistance_ohm", p.gap_resistance_ohm},
            {"conductance_G0", p.conductance_G0},
            {"decay_constant_per_nm", p.decay_constant_per_m * 1e-9},
            {"nm_per_decade", p.nm_per_decade},
            {"apparent_barrier_eV", p.apparent_barrier_J / eV},
            {"regime", p.reachable() ? nlohmann::json(to_string(p.kind)) : nlohmann::json(nullptr)},
            {"status", to_string(p.solution.status)},
            {"evaluations", p.evaluations},
            {"warnings", p.warnings}};
}

void run(const plan_args& a) {
    config c = load_config_or_default(a.config_path);
    if (!a.plot_path.empty()) plot::format_from_path(a.plot_path);  // a bad extension fails before the work
    a.uncertainty.validate();
    auto currents = parse_sweep(a.current, dimension::current, a.points, spacing::logarithmic, "--current");
    auto biases = parse_sweep(a.bias, dimension::voltage, a.points, spacing::linear, "--bias");
    std::vector<std::pair<double, double>> setpoints;
    for (double I : currents)
        for (double V : biases) setpoints.emplace_back(I, V);
    plan_options options;
    std::vector<plan_point> points;
    try {
        points = plan_setpoints(c, setpoints, options, a.threads);
    } catch (const error& e) {
        // Name the option the bad value came from.
        if (e.kind() == error_kind::input && (e.where().key == "current" || e.where().key == "bias")) {
            location w;
            w.key = "--" + e.where().key;
            throw error(error_kind::input, w, e.detail());
        }
        throw;
    }

    // Uncertainty per reachable point, when the config gives any.
    std::vector<uncertainty_summary> u(points.size());
    const bool with_u = c.sigma.any();
    if (with_u) {
        uncertainty_options uo = a.uncertainty;
        uo.threads = a.threads;
        for (std::size_t i = 0; i < points.size(); ++i)
            if (points[i].reachable()) u[i] = plan_uncertainty(c, points[i].setpoint_A, points[i].bias_V, options, uo);
    }

    std::size_t shown = 0, warned = 0;
    for (const auto& p : points) {
        if (p.warnings.empty()) continue;
        ++warned;
        if (shown++ < 3) print_warnings(p.warnings, fmt::format("{:g} A at {:g} V", std::abs(p.setpoint_A), p.bias_V));
    }
    if (warned > 3) fmt::print(stderr, "tipgap: warning: ... and {} more setpoints with warnings (see the output)\n", warned - 3);

    std::string text;
    if (a.format == output_format::json) {
        nlohmann::json j;
        j["command"] = "plan";
        j["config"] = config_json(c);
        j["gap_range_nm"] = {options.gap_min_m * 1e9, options.gap_max_m * 1e9};
        j["points"] = nlohmann::json::array();
        for (std::size_t i = 0; i < points.size(); ++i) {
            auto pj = point_json(points[i]);
            add_uncertainty_json(pj, u[i]);
            j["points"].push_back(pj);
        }
        if (with_u) {
            for (const auto& x : u)
                if (!x.inputs.empty()) {
                    j["uncertainty"] = uncertainty_info_json(x);
                    break;
                }
        }
        text = j.dump(2) + "\n";
    } else if (a.format == output_format::csv) {
        std::vector<std::string> head{"bias_V",        "current_A",           "gap_nm",        "gap_resistance_ohm",
                                      "conductance_G0", "decay_constant_per_nm", "nm_per_decade", "apparent_barrier_eV",
                                      "regime",        "status",              "evaluations"};
        if (with_u) {
            for (const char* n : {"gap_nm", "nm_per_decade", "apparent_barrier_eV"})
                for (const char* suffix : {"_stddev", "_ci95_low", "_ci95_high", "_linear_stddev"})
                    head.push_back(std::string(n) + suffix);
        }
        text = csv_line(head);
        for (std::size_t i = 0; i < points.size(); ++i) {
            auto j = point_json(points[i]);
            auto num = [&](const char* k) { return j[k].is_null() ? std::string("NaN") : full_precision(j[k].get<double>()); };
            std::vector<std::string> row{num("bias_V"), num("current_A"), num("gap_nm"), num("gap_resistance_ohm"),
                                         num("conductance_G0"), num("decay_constant_per_nm"), num("nm_per_decade"),
                                         num("apparent_barrier_eV"),
                                         j["regime"].is_null() ? "" : j["regime"].get<std::string>(),
                                         j["status"].get<std::string>(), std::to_string(points[i].evaluations)};
            if (with_u) {
                for (std::size_t k = 0; k < 3; ++k) {
                    const bool have = !u[i].values.empty() && !u[i].inputs.empty();
                    const uncertain_value v = have ? u[i].values[k] : uncertain_value{};
                    for (double x : {v.mc_stddev, v.ci95_low, v.ci95_high, v.linear_stddev}) row.push_back(full_precision(x));
                }
            }
            text += csv_line(row);
        }
    } else {
        text_table t;
        t.headers = {"bias [V]", "I [A]", "gap [nm]", "R [Ω]", "G [G0]", "nm/decade", "φ_ap [eV]", "regime"};
        for (std::size_t i = 0; i < points.size(); ++i) {
            const auto& p = points[i];
            const bool have = with_u && !u[i].inputs.empty();
            auto sd = [&](std::size_t k) {
                if (!have) return std::numeric_limits<double>::quiet_NaN();
                const auto& v = u[i].values[k];
                return u[i].samples > 0 ? v.mc_stddev : v.linear_stddev;
            };
            t.rows.push_back({rounded(p.bias_V), rounded(std::abs(p.setpoint_A)), rounded_pm(p.solution.gap_m * 1e9, sd(0)),
                              rounded(p.gap_resistance_ohm), rounded(p.conductance_G0), rounded_pm(p.nm_per_decade, sd(1)),
                              rounded_pm(p.apparent_barrier_J / si::electron_volt, sd(2)),
                              p.reachable() ? to_string(p.kind) : "unreachable"});
        }
        text = fmt::format("# {} · T = {} K · image {} · method {} · geometry {} · gap range {:g}..{:g} nm\n", c.source,
                           c.model.temperature_K, to_string(c.model.image), to_string(c.model.method),
                           to_string(c.geometry.kind), options.gap_min_m * 1e9, options.gap_max_m * 1e9);
        if (with_u) {
            const uncertainty_summary* any = nullptr;
            for (const auto& x : u)
                if (!x.inputs.empty()) any = &x;
            if (any)
                text += any->samples > 0
                            ? fmt::format("# ± : Monte Carlo standard uncertainty, {} draws, seed {} (inputs: {})\n",
                                          any->samples, any->seed, fmt::join(any->inputs, ", "))
                            : fmt::format("# ± : linear propagation (inputs: {})\n", fmt::join(any->inputs, ", "));
        }
        text += t.render();
    }
    write_output(a.output, text);
    if (!a.plot_path.empty()) plot::write_figure(plan_figure(c, points, a.threads), a.plot_path);
}

}  // namespace

void add_plan(CLI::App& app) {
    auto a = std::make_shared<plan_args>();
    auto* cmd = app.add_subcommand("plan", "Plan a setpoint: the gap that gives a current at a bias, with its "
                                           "resistance, conductance, decay and warnings");
    cmd->add_option("--config,-c", a->config_path, "Junction configuration (YAML); default: the built-in one");
    cmd->add_option("--current", a->current,
                    "Current setpoint: one value (1nA), a list (10pA,100pA,1nA) or a range FROM..TO (logarithmic "
                    "steps); the magnitude is used, the sign follows the bias")
        ->required();
    cmd->add_option("--bias", a->bias, "Sample bias: one value (0.1V), a list or a range FROM..TO (the z(V) trace)")
        ->required();
    cmd->add_option("--points", a->points, "Points per range (default 11)")->check(CLI::Range(2, 1000000));
    cmd->add_option("--threads", a->threads, "Worker threads (default: all cores)")->check(CLI::Range(0, 256));
    cmd->add_option("--plot", a->plot_path, "Also write a figure: FILE.png, FILE.svg or FILE.pdf");
    add_uncertainty_options(cmd, a->uncertainty);
    add_output_options(cmd, a->format, a->output);
    cmd->callback([a] { run(*a); });
}

}  // namespace tipgap::cli
