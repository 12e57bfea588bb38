// tipgap: command-line entry point. Parses arguments, runs one subcommand, and turns every
// error into one line on stderr and a documented exit code (README "Exit codes").
#include <cstdio>
#include <exception>
#include <new>

#include "commands.hpp"
#include "errors.hpp"
#include "tipgap/core/error.hpp"

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
    tipgap::cli::add_resonances(app);
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
        return tipgap::cli::report_parse_error(app, e);
    } catch (const tipgap::error& e) {
        return tipgap::cli::report_error(e);
    } catch (const std::bad_alloc&) {
        return tipgap::cli::report_internal_error("out of memory");
    } catch (const std::exception& e) {
        return tipgap::cli::report_internal_error(e.what());
    } catch (...) {
        return tipgap::cli::report_internal_error("an exception that is not a std::exception");
    }
    return 0;
}
