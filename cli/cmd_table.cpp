// tipgap table: a quick-reference table of decay rates for the config's tip against sample materials.
#include <fmt/format.h>
#include <memory>

#include "command.hpp"
#include "flags.hpp"
#include "output.hpp"
#include "shared_flags.hpp"
#include "tipgap/config/config_summary.hpp"
#include "tipgap/plan/reference_table.hpp"
#include "tipgap/plan/reference_table_columns.hpp"

namespace tipgap::cli {
namespace {

struct table_args {
    std::string samples, current = "1nA", bias = "0.1V", output;
    int threads = 0;
    output_format format = output_format::table;
    junction_flags junction;
};

void run(const table_args& a) {
    const config c = load_junction(a.junction);
    const double I = parse_quantity(a.current, dimension::current, location{"", 0, 0, "--current"});
    const double V = parse_quantity(a.bias, dimension::voltage, location{"", 0, 0, "--bias"});
    const std::string& samples = a.samples.empty() ? a.junction.text.sample : a.samples;  // "" : every material
    const std::vector<std::string> names = samples.empty() ? std::vector<std::string>{} : split_list(samples);
    const auto rows = naming_flags("table", flag_error::own_kind,
                                   [&] { return reference_table(c, names, I, V, {}, a.threads); });
    for (const auto& r : rows) print_warnings(r.warnings, r.sample);

    report_frame frame{.rows_key = "rows", .sort_keys = true, .before_table = reference_table_header(c, I, V)};
    frame.json.set("command", "table");
    frame.json.set("config", config_record(c));
    record setpoint;
    setpoint.set("current_A", I);
    setpoint.set("bias_V", V);
    frame.json.set("reference_setpoint", setpoint);
    write_output(a.output, render(a.format, reference_columns(), rows, frame));
}

}  // namespace

command table_command() {
    auto a = std::make_shared<table_args>();
    command cmd{"table", "Quick-reference table: barrier, decay constant, nm per decade, apparent barrier and gap at a "
                         "reference setpoint, for sample materials"};
    cmd.flags = {
        {"--samples", "Sample materials from the library, comma-separated (gold,graphite); default: --sample when given, else all", &a->samples},
        {"--current", "Reference setpoint current (default 1nA)", &a->current},
        {"--bias", "Reference setpoint bias (default 0.1V)", &a->bias},
        {"--threads", "Worker threads (default: all cores)", &a->threads, "", false, std::pair{0, 256}},
    };
    for (auto list : {junction_flag_list(a->junction), output_flags(a->format, a->output)})
        cmd.flags.insert(cmd.flags.end(), list.begin(), list.end());
    cmd.run = [a](const std::string&) { run(*a); };
    return cmd;
}

}  // namespace tipgap::cli
