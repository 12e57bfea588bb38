#pragma once
// The junction flags shared by predict, plan, table, synth and resonances: --config, --tip,
// --sample, --tip-work-function, --sample-work-function, --temperature, --image, --method and
// --show-config. Values go through the library's overlay (tipgap::apply_overlay): built-in default
// < config file < command line.
#include <string>
#include <vector>

#include "command.hpp"
#include "tipgap/config/config.hpp"

namespace tipgap::cli {

struct junction_flags {
    std::string config_path;
    junction_text text;  // --tip, --sample, ... as given
    bool show = false;
};

// The flags, --show-config last: it prints the merged config with each value's origin and ends the
// command (exit 0) before the command's own required flags are checked.
std::vector<flag> junction_flag_list(junction_flags& j);

// The merged config; a bad value is a usage error naming its flag.
config load_junction(const junction_flags& j);

}  // namespace tipgap::cli
