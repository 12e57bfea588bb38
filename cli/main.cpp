// tipgap: command-line entry point, and the one file that includes CLI11. Builds the parser from
// each command's flag list (command.hpp), runs one subcommand, and turns every error into one line
// on stderr and a documented exit code (README "Exit codes"):
//   tipgap: <kind>: <file>:<line>:<column>: <key>: <what was wrong>; expected <what was expected>
// kind is "error" (bad input, exit 3), "usage error" (bad command line, exit 2), "no answer" (a
// well-formed request without a solution, exit 4) or "internal error" (a bug, exit 70).
#include <CLI/CLI.hpp>
#include <charconv>
#include <cstdio>
#include <fmt/format.h>
#include <vector>

#include "command.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/core/error_line.hpp"
#include "tipgap/core/interrupt.hpp"
#include "tipgap/core/progress.hpp"
#include "tipgap/core/usage_message.hpp"
#include "tipgap/io/output_path.hpp"
#include "tipgap/io/output_transaction.hpp"

namespace tipgap::cli {
namespace {

template <class... F>
struct overloaded : F... {
    using F::operator()...;
};

// The output format by its name (enum_names<output_format>, tipgap/io/report.hpp).
CLI::Option* add_format(CLI::App* cmd, const flag& f, output_format& format) {
    return cmd->add_option_function<std::string>(
        f.names,
        [&format, name = f.names](const std::string& s) {
            if (!from_string(s, format))
                throw CLI::ValidationError(name, quote_input(s) + " is not an output format; expected " +
                                                     accepted_names<output_format>());
        },
        f.help);
}

void add_flag(CLI::App* cmd, const flag& f) {
    CLI::Option* o = std::visit(overloaded{[&](bool* p) { return cmd->add_flag(f.names, *p, f.help); },
                                           [&](output_format* p) { return add_format(cmd, f, *p); },
                                           [&](auto* p) { return cmd->add_option(f.names, *p, f.help); }},
                                f.target);
    // CLI11 would wrap "18446744073709551616" or "-1" into a valid-looking unsigned number.
    if (std::holds_alternative<std::uint64_t*>(f.target))
        o->check(CLI::Validator(
            [](std::string& s) -> std::string {
                std::uint64_t v = 0;
                const auto [end, ec] = std::from_chars(s.data(), s.data() + s.size(), v);
                if (ec == std::errc::result_out_of_range) return quote_input(s) + " is beyond 2^64 - 1 = 18446744073709551615";
                if (ec != std::errc() || end != s.data() + s.size()) return quote_input(s) + " is not a whole number >= 0";
                return "";
            },
            "UINT"));
    if (!f.type_name.empty()) o->type_name(f.type_name);
    if (f.required) o->required();
    if (f.range) o->check(CLI::Range(f.range->first, f.range->second));
    if (!f.default_text.empty()) o->default_str(f.default_text);
    if (f.then) o->each([then = f.then](const std::string&) { then(); });
}

// The command as parsed, in a canonical order, for the metadata of the files it writes.
std::string command_line(const CLI::App* cmd) {
    std::string s = "tipgap " + cmd->get_name();
    for (const CLI::Option* opt : cmd->get_options()) {
        if (opt->count() == 0 || opt->get_name() == "--help") continue;
        for (const std::string& v : opt->results()) {
            const bool quote = v.find_first_of(" \t'\"") != std::string::npos || v.empty();
            s += fmt::format(" {} {}", opt->get_name(), quote ? "'" + v + "'" : v);
        }
    }
    return s;
}

// The files a run reads and writes, by option name, for the checks before any work.
struct run_paths {
    std::vector<std::string> inputs;
    std::vector<run_output> outputs;
};
run_paths paths_of(const CLI::App* cmd) {
    run_paths r;
    for (const CLI::Option* opt : cmd->get_options()) {
        const std::string n = opt->get_name();
        const bool dir = n == "--output-dir" || (n == "--out" && cmd->get_name() == "demo");
        for (const std::string& v : opt->results()) {
            if (n == "files" || n == "file" || n == "grid" || n == "--config") r.inputs.push_back(v);
            if (n == "--output" || n == "--plot" || n == "--out" || n == "--truth" || dir) r.outputs.push_back({v, dir});
        }
    }
    return r;
}

// Runs a command with its outputs in one transaction: all are written or none.
void add_command(CLI::App& app, command c) {
    CLI::App* cmd = app.add_subcommand(c.name, c.description);
    for (const flag& f : c.flags) add_flag(cmd, f);
    cmd->callback([cmd, run = std::move(c.run)] {
        run_paths p = paths_of(cmd);
        check_run_paths(p.inputs, p.outputs);
        const CLI::Option* quiet = cmd->get_option_no_throw("--quiet");
        progress_scope progress("tipgap " + cmd->get_name(), !(quiet && quiet->count() > 0));
        output_transaction outputs(std::move(p.inputs));
        run(command_line(cmd));
        outputs.commit();
    });
}

// "tipgap predict" for a failure inside `predict`, else "tipgap".
std::string command_name(const CLI::App& app) {
    for (const CLI::App* sub : app.get_subcommands()) return "tipgap " + sub->get_name();
    return "tipgap";
}

// "--gap VALUE" / "FILE...": how the option is written, from its type name when it has one.
std::string option_usage(const CLI::App& app, const std::string& name) {
    std::string type = "VALUE";
    for (const CLI::App* sub : app.get_subcommands()) {
        if (const CLI::Option* o = sub->get_option_no_throw(name)) {
            if (!o->get_type_name().empty() && o->get_type_name() != "TEXT") type = o->get_type_name();
            if (o->get_positional() && o->get_lnames().empty() && o->get_snames().empty()) return type;
        }
    }
    return name + " " + type;
}

std::string subcommand_list(const CLI::App& app) {
    std::string out;
    for (const CLI::App* sub : app.get_subcommands([](const CLI::App*) { return true; })) {
        if (sub->get_name().empty()) continue;
        out += (out.empty() ? "" : ", ") + sub->get_name();
    }
    return out;
}

int report_parse_error(const CLI::App& app, const CLI::ParseError& e) {
    const usage_context c{command_name(app), subcommand_list(app), app.remaining(),
                          [&app](const std::string& name) { return option_usage(app, name); }};
    std::fprintf(stderr, "tipgap: usage error: %s\n", one_line(usage_message(e.what(), c)).c_str());
    return static_cast<int>(error_kind::usage);
}

}  // namespace
}  // namespace tipgap::cli

int main(int argc, char** argv) {
    using namespace tipgap::cli;
    CLI::App app{"tipgap: tunnelling-gap model, setpoint planner and current-distance fitter for STM users"};
    app.set_version_flag("--version", std::string("tipgap ") + TIPGAP_VERSION);
    app.require_subcommand(1, 1);
    app.fallthrough(false);
    tipgap::install_interrupt_handlers();
    for (auto make : {predict_command, plan_command, table_command, fit_command, map_command, synth_command, resonances_command, demo_command})
        add_command(app, make());
    try {
        app.parse(argc, argv);
    } catch (const finished&) {
        return 0;
    } catch (const CLI::CallForHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForAllHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForVersion& e) {
        return app.exit(e);
    } catch (const CLI::ParseError& e) {
        return report_parse_error(app, e);
    } catch (...) {
        const tipgap::failure f = tipgap::current_failure();  // a tipgap::error, or a bug
        std::fprintf(stderr, "%s\n", f.line.c_str());
        return f.exit_code;
    }
    return 0;
}
