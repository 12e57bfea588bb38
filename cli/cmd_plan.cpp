// tipgap plan: the gap for a current setpoint at a bias; bias ranges give the constant-current trace
// z(V), current lists or ranges give setpoint ladders.
#include <algorithm>
#include <fmt/format.h>
#include <memory>

#include "command.hpp"
#include "flags.hpp"
#include "output.hpp"
#include "shared_flags.hpp"
#include "tipgap/config/config_summary.hpp"
#include "tipgap/figures/figures.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/plan_columns.hpp"
#include "tipgap/plan/uncertainty_columns.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap::cli {
namespace {

struct plan_args {
    std::string current, bias, step, reference_bias, output, plot_path;
    int points = 11;
    int threads = 0;
    output_format format = output_format::table;
    uncertainty_options uncertainty;
    plot_flags plot;
    junction_flags junction;
};

void run(const plan_args& a) {
    const config c = load_junction(a.junction);
    if (!a.plot_path.empty()) plot::format_from_path(a.plot_path);  // a bad extension fails before the work
    const figure_options figure = to_figure_options(a.plot);
    a.uncertainty.validate();
    const auto currents = parse_range(a.current, dimension::current, a.points, spacing::logarithmic, "--current");
    const auto biases = parse_range(a.bias, dimension::voltage, a.points, spacing::linear, "--bias", a.step);
    plan_options options;
    if (!a.reference_bias.empty()) options.reference_bias_V = flag_quantity(a.reference_bias, dimension::voltage, "--reference-bias");
    const auto points = naming_flags("plan", flag_error::own_kind,
                                     [&] { return plan_setpoints(c, all_pairs(currents, biases, false), options, a.threads); });
    uncertainty_options uo = a.uncertainty;
    uo.threads = a.threads;
    const std::vector<uncertainty_summary> u = plan_uncertainties(c, points, options, uo);
    print_first_warnings(
        points, [](const plan_point& p) { return fmt::format("{:g} A at {:g} V", std::abs(p.setpoint_A), p.bias_V); },
        "setpoints");
    if (const auto zero = std::find_if(points.begin(), points.end(), [](const plan_point& p) { return !p.note.empty(); });
        zero != points.end())
        fmt::print(stderr, "tipgap: note: 0 V: {}\n", zero->note);

    std::vector<plan_row> rows;
    for (std::size_t i = 0; i < points.size(); ++i) rows.push_back({&points[i], &u[i]});
    report_frame frame{.rows_key = "points", .sort_keys = true};
    frame.json.set("command", "plan");
    frame.json.set("config", config_record(c));
    frame.json.set("gap_range_nm", cell::list{options.gap_min_m * 1e9, options.gap_max_m * 1e9});
    if (const uncertainty_summary* x = first_uncertain(u)) frame.json.set("uncertainty", uncertainty_info(*x));
    frame.before_table = config_line(c) + fmt::format(" · gap range {:g}..{:g} nm\n", options.gap_min_m * 1e9, options.gap_max_m * 1e9) +
                         uncertainty_line(u, "");
    // With configured uncertainties the CSV has their columns, NaN where a setpoint has none.
    std::vector<std::string> names;
    if (c.sigma.any())
        for (const auto& x : u)
            if (!x.names.empty() && names.empty()) names = x.names;
    write_output(a.output, render(a.format, plan_columns(names), rows, frame));
    if (!a.plot_path.empty()) plot::write_figure(plan_figure(c, points, a.threads, figure), a.plot_path);
}

}  // namespace

command plan_command() {
    auto a = std::make_shared<plan_args>();
    command cmd{"plan", "Plan a setpoint: the gap that gives a current at a bias, with its resistance, conductance, decay and warnings"};
    cmd.flags = {
        {"--current",
         "Current setpoint: one value (1nA), a list (10pA,100pA,1nA) or a range FROM..TO (logarithmic steps); the "
         "magnitude is used, the sign follows the bias",
         &a->current, "", true},
        {"--bias", "Sample bias: one value (0.1V), a list or a range FROM..TO (the z(V) trace)", &a->bias, "", true},
        {"--points", "Points per range (default 11)", &a->points, "", false, std::pair{2, 1000000}},
        {"--step", "Step of the bias range instead of --points, e.g. 0.1V (must divide the range)", &a->step, "VOLTAGE"},
        {"--reference-bias", "Bias whose gap is Δz = 0 (dz_nm) for each current (default: the first non-zero bias)",
         &a->reference_bias, "VOLTAGE"},
        {"--threads", "Worker threads (default: all cores)", &a->threads, "", false, std::pair{0, 256}},
        {"--plot", "Also write a figure: FILE.png, FILE.svg or FILE.pdf", &a->plot_path},
    };
    for (auto list : {junction_flag_list(a->junction), plot_flag_list(a->plot, true), uncertainty_flags(a->uncertainty), output_flags(a->format, a->output)})
        cmd.flags.insert(cmd.flags.end(), list.begin(), list.end());
    cmd.run = [a](const std::string&) { run(*a); };
    return cmd;
}

}  // namespace tipgap::cli
