#pragma once
// Each subcommand adds itself to the app; main() lists them. No physics here.
#include <CLI/CLI.hpp>

namespace tipgap::cli {

void add_predict(CLI::App& app);
void add_plan(CLI::App& app);
void add_table(CLI::App& app);

}  // namespace tipgap::cli
