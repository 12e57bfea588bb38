// tipgap: command-line entry point. Parses arguments, runs one subcommand, and turns every
// error into one line on stderr and a documented exit code (README "Exit codes").
#include <cstdio>
#include <exception>
#include <fmt/format.h>

#include "commands.hpp"
#include "tipgap/error.hpp"

int main(int argc, char** argv) {
    CLI::App app{"tipgap: tunnelling-gap model, setpoint planner and current-distance fitter for STM users"};
    app.set_version_flag("--version", std::string("tipgap ") + TIPGAP_VERSION);
    app.require_subcommand(1, 1);
    app.fallthrough(false);
    tipgap::cli::add_predict(app);
    tipgap::cli::add_plan(app);
    tipgap::cli::add_table(app);
    tipgap::cli::add_fit(app);
    tipgap::cli::add_map(app);
    tipgap::cli::add_synth(app);
    tipgap::cli::add_demo(app);

    try {
        app.parse(argc, argv);
    } catch (const CLI::CallForHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForAllHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForVersion& e) {
        return app.exit(e);
    } catch (const CLI::ParseError& e) {
        fmt::print(stderr, "tipgap: usage error: {}\nRun 'tipgap --help' for the commands and options.\n",
                   e.what());
        return static_cast<int>(tipgap::error_kind::usage);
    } catch (const tipgap::error& e) {
        const char* label = e.kind() == tipgap::error_kind::usage       ? "usage error"
                            : e.kind() == tipgap::error_kind::no_answer ? "no answer"
                                                                        : "error";
        fmt::print(stderr, "tipgap: {}: {}\n", label, e.what());
        return static_cast<int>(e.kind());
    } catch (const std::exception& e) {
        fmt::print(stderr, "tipgap: internal error (this is a bug; please report it): {}\n", e.what());
        return 70;
    }
    return 0;
}
