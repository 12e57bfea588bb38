// tipgap fit: decay constant and apparent barrier height of measured I(z) curves. Parses flags
// into tipgap::fit_options, calls the library per file and formats the results.
#include <fmt/format.h>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "command.hpp"
#include "output.hpp"
#include "shared_flags.hpp"
#include "tipgap/figures/fit_plot.hpp"
#include "tipgap/fit/fit_columns.hpp"
#include "tipgap/fit/fit_report.hpp"
#include "tipgap/fit/fit_summary.hpp"
#include "tipgap/fit/fitted_sweep.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap::cli {
namespace {

struct fit_args {
    std::vector<std::string> files;
    fit_flags flags = [] {
        fit_flags f;
        f.model = "offset";  // honest offset and noise model by default (issue 10); map keeps linear
        return f;
    }();
    read_flags read;
    output_format format = output_format::table;
    std::string output;
    std::string plot;         // --plot FILE: one figure per fitted sweep
    std::string config_path;  // --config FILE: model comparison
};

// The reader's notes of every file (a bias, temperature or unit given that the file states
// otherwise), on stderr now and in the JSON document.
std::vector<std::string> reader_notes(const std::vector<std::unique_ptr<measured_curve>>& curves) {
    std::vector<std::string> out;
    for (const auto& c : curves) {
        print_notes(c->notes, c->file);
        for (const std::string& n : c->notes) out.push_back(fmt::format("{}: {}", c->file, n));
    }
    return out;
}

void run(const fit_args& args) {
    const fit_options options = to_fit_options(args.flags, "fit");
    const reader_options reading = to_reader_options(args.read, "fit", 2);
    std::optional<config> model_config;
    // "default" names the built-in config (configs/default.yaml), as used by the demo.
    if (!args.config_path.empty())
        model_config = args.config_path == "default" ? default_config() : load_config(args.config_path);
    if (!args.plot.empty()) (void)plot::format_from_path(args.plot);  // a bad format fails before the (slow) fits
    std::vector<std::unique_ptr<measured_curve>> curves;
    std::vector<fitted_sweep> all;
    for (const std::string& file : args.files) {
        curves.push_back(std::make_unique<measured_curve>(read_curve_csv(file, reading)));
        for (fitted_sweep& f : fit_and_compare(*curves.back(), options, model_config ? &*model_config : nullptr))
            all.push_back(std::move(f));
    }
    if (!args.plot.empty()) write_fit_plots(all, args.plot);
    // Several sweeps: their weighted mean, spread and approach-retract difference.
    std::vector<fit_result> results;
    for (const fitted_sweep& f : all) results.push_back(f.result);
    const fit_summary summary = summarise_fits(results);
    report_frame frame{.rows_key = "curves",
                       .after_table = model_comparison_text(all) + fit_notes_text(all) + (all.size() > 1 ? describe_summary(summary) : ""),
                       .layout = {.rule = false}};
    frame.json.set("notes", reader_notes(curves));
    if (all.size() > 1) frame.json.set("summary", to_record(fit_summary_columns(), summary));
    const bool with_model = !all.empty() && all.front().model.has_value();
    write_output(args.output, render(args.format, fitted_sweep_columns(with_model), all, frame));
}

}  // namespace

command fit_command() {
    auto a = std::make_shared<fit_args>();
    command cmd{"fit", "Decay constant and apparent barrier height from measured I(z) curves (one CSV file per curve)"};
    cmd.flags = {{"files",
                  "Curve files: '# key: value' metadata, a header such as 'z [nm],current [nA]' (comma, tab, semicolon or "
                  "whitespace separated; units in [], () or after /), rows",
                  &a->files, "FILE...", true}};
    for (const flag& f : read_flag_list(a->read, false)) cmd.flags.push_back(f);
    for (const flag& f : fit_flag_list(a->flags, true)) cmd.flags.push_back(f);
    cmd.flags.push_back({"--plot",
                         "Figure of each fitted sweep (PNG, SVG or PDF by extension): ln|I| with fit and band, residuals, "
                         "phi_ap(z); several sweeps go to FILE-<curve file stem>.png (FILE-<stem>-approach.png when a file has both "
                         "directions)",
                         &a->plot, "FILE"});
    cmd.flags.push_back({"--config",
                         "Model comparison: fit the tunnelling model of this config (mean work function, gap offset, "
                         "prefactor) to each sweep; 'default' is the built-in config",
                         &a->config_path, "FILE"});
    cmd.flags.push_back(format_flag(a->format));
    cmd.flags.push_back({"--output", "Write the report to FILE (atomically) instead of stdout", &a->output, "FILE"});
    cmd.run = [a](const std::string&) { run(*a); };
    return cmd;
}

}  // namespace tipgap::cli
