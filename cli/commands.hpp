#pragma once
// Each subcommand adds itself to the app; main() lists them. No physics here.
#include <CLI/CLI.hpp>

namespace tipgap::cli {

// (subcommands are declared here as they land)

}  // namespace tipgap::cli
