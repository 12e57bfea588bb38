// tipgap resonances: field-emission resonance peaks of a measured z(V) or dI/dV(V) trace and the
// sample's local work function from them: flags -> tipgap::resonance_options -> analyse_resonances
// -> declared columns (tipgap/fit/resonance_columns.hpp).
#include <fmt/format.h>
#include <memory>

#include "command.hpp"
#include "flags.hpp"
#include "output.hpp"
#include "shared_flags.hpp"
#include "tipgap/figures/resonance_plot.hpp"
#include "tipgap/fit/resonance_columns.hpp"
#include "tipgap/fit/resonances.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap::cli {
namespace {

struct resonance_args {
    std::string file, smoothing, output, plot_path;
    bool formula_only = false;
    int threads = 0;
    output_format format = output_format::table;
    junction_flags junction;
};

resonance_options options_of(const resonance_args& a) {
    resonance_options o;
    if (!a.smoothing.empty()) o.smoothing_half_width_V = 0.5 * flag_quantity(a.smoothing, dimension::voltage, "--smoothing");
    o.model_fit = !a.formula_only;
    o.threads = a.threads;
    naming_flags("resonances", flag_error::usage, [&] { o.validate(); });
    return o;
}

void run(const resonance_args& a) {
    const config c = load_junction(a.junction);
    if (!a.plot_path.empty()) plot::format_from_path(a.plot_path);  // a bad extension fails before the work
    const resonance_options o = options_of(a);
    const bias_trace t = read_bias_trace(a.file);
    const resonance_result r = analyse_resonances(c, t, o);
    const bool asked = r.status == resonance_status::formula_only && a.formula_only;
    if (r.status != resonance_status::ok && !asked) print_warnings({r.message}, a.file);
    write_output(a.output, resonance_report(a.format, t, c, r));
    if (!a.plot_path.empty()) plot::write_figure(make_resonance_figure(t, r, a.file), a.plot_path);
}

}  // namespace

command resonances_command() {
    auto a = std::make_shared<resonance_args>();
    command cmd{"resonances", "Field-emission resonances of a z(V) or dI/dV(V) trace and the sample's local work "
                              "function from them"};
    cmd.flags = {
        {"file", "Trace: '# current: 1 nA', header 'bias [V],z [nm]' (or 'bias [V],didv [nS]'), rows", &a->file, "FILE",
         true},
        {"--smoothing", "Full width of the smoothing window (default 0.6V)", &a->smoothing, "VOLTAGE"},
        {"--formula-only", "Peaks and the triangular-well formula only (no model fit)", &a->formula_only},
        {"--threads", "Worker threads for the model traces (default: all cores)", &a->threads, "", false, std::pair{0, 256}},
        {"--plot", "Also write a figure: FILE.png, FILE.svg or FILE.pdf", &a->plot_path, "FILE"},
    };
    for (auto list : {junction_flag_list(a->junction), output_flags(a->format, a->output)})
        cmd.flags.insert(cmd.flags.end(), list.begin(), list.end());
    cmd.run = [a](const std::string&) { run(*a); };
    return cmd;
}

}  // namespace tipgap::cli
