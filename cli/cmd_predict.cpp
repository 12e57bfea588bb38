// tipgap predict: the forward model at one point, a sweep or a (gap, bias) grid.
#include <fmt/format.h>
#include <memory>

#include "command.hpp"
#include "flags.hpp"
#include "output.hpp"
#include "shared_flags.hpp"
#include "tipgap/config/config_summary.hpp"
#include "tipgap/figures/figures.hpp"
#include "tipgap/plan/predict.hpp"
#include "tipgap/plan/predict_columns.hpp"
#include "tipgap/plan/uncertainty_columns.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap::cli {
namespace {

struct predict_args {
    std::string gap, bias, step, output, plot_path;
    int points = 11;
    int threads = 0;
    output_format format = output_format::table;
    uncertainty_options uncertainty;
    plot_flags plot;
    junction_flags junction;
};

void run(const predict_args& a) {
    const config c = load_junction(a.junction);
    if (!a.plot_path.empty()) plot::format_from_path(a.plot_path);  // a bad extension fails before the work
    const figure_options figure = to_figure_options(a.plot);
    a.uncertainty.validate();
    const auto gaps = parse_range(a.gap, dimension::length, a.points, spacing::linear, "--gap");
    const auto biases = parse_range(a.bias, dimension::voltage, a.points, spacing::linear, "--bias", a.step);
    refuse_huge_grid(gaps.size(), biases.size(), "--points");
    const auto points = all_pairs(gaps, biases, true);  // bias outer, gap inner
    const auto results = naming_flags("predict", flag_error::own_kind, [&] { return predict_points(c, points, a.threads); });
    uncertainty_options uo = a.uncertainty;
    uo.threads = a.threads;
    const std::vector<uncertainty_summary> u = predict_uncertainties(c, points, uo);
    print_first_warnings(
        results, [](const prediction& r) { return fmt::format("gap {:.4g} nm, bias {:.4g} V", r.q.gap_m * 1e9, r.q.bias_V); },
        "points");

    std::vector<predict_row> rows;
    for (std::size_t i = 0; i < results.size(); ++i) rows.push_back({&results[i], &u[i]});
    const uncertainty_summary* with_u = c.sigma.any() && !u.front().inputs.empty() ? &u.front() : nullptr;
    report_frame frame{.rows_key = "points", .sort_keys = true};
    frame.json.set("command", "predict");
    frame.json.set("config", config_record(c));
    if (with_u) frame.json.set("uncertainty", uncertainty_info(*with_u));
    frame.before_table = config_line(c) + "\n" + uncertainty_line(u, " of I");
    const auto columns = predict_columns(with_u ? with_u->names : std::vector<std::string>{});
    write_output(a.output, render(a.format, columns, rows, frame));
    if (!a.plot_path.empty()) plot::write_figure(predict_figure(c, gaps, biases, results, a.threads, figure), a.plot_path);
}

}  // namespace

command predict_command() {
    auto a = std::make_shared<predict_args>();
    command cmd{"predict", "Predict current, conductance, decay constant and apparent barrier height at given gaps and biases"};
    cmd.flags = {
        {"--gap", "Gap: one value (0.6nm), a list (0.5nm,0.6nm) or a range FROM..TO", &a->gap, "", true},
        {"--bias", "Sample bias: one value (0.1V, -0.5V), a list or a range FROM..TO", &a->bias, "", true},
        {"--points", "Points per range (default 11)", &a->points, "", false, std::pair{2, 1000000}},
        {"--step", "Step of the bias range instead of --points, e.g. 0.1V (must divide the range)", &a->step, "VOLTAGE"},
        {"--threads", "Worker threads (default: all cores)", &a->threads, "", false, std::pair{0, 256}},
        {"--plot", "Also write a figure: FILE.png, FILE.svg or FILE.pdf", &a->plot_path},
    };
    for (auto list : {junction_flag_list(a->junction), plot_flag_list(a->plot, false), uncertainty_flags(a->uncertainty), output_flags(a->format, a->output)})
        cmd.flags.insert(cmd.flags.end(), list.begin(), list.end());
    cmd.run = [a](const std::string&) { run(*a); };
    return cmd;
}

}  // namespace tipgap::cli
