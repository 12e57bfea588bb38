#pragma once
// The flag sets shared between commands, each with one set of flag names, help texts and messages:
// - the junction flags of predict, plan, table, synth and resonances: --config, --tip, --sample,
//   --tip-work-function, --sample-work-function, --temperature, --image, --method and
//   --show-config. Values go through the library's overlay (tipgap::apply_overlay): built-in
//   default < config file < command line.
// - the reader options of fit and map (delimiter, columns, units, z orientation, and the bias and
//   temperature of files that do not state them) and their fit options.
// (The output, figure and uncertainty flags are in output.hpp.)
#include <cstddef>
#include <string>
#include <vector>

#include "command.hpp"
#include "tipgap/config/config.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/io/reader_options.hpp"

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

struct read_flags {
    std::string delimiter, columns, z_unit, current_unit, xy_unit, bias, temperature;
    bool flip_z = false;
};

// --delimiter, --columns, --z-unit, --current-unit, (grid) --xy-unit, --flip-z, --bias and
// --temperature.
std::vector<flag> read_flag_list(read_flags& f, bool grid);

// The options the flags ask for, validated by the library for `roles` columns (2: z, current; 4:
// x, y, z, current); a bad value is a usage error naming its flag. command: "fit" or "map".
reader_options to_reader_options(const read_flags& f, const char* command, std::size_t roles);

// Prints each note of `file` to stderr as "tipgap: note: FILE: ...".
void print_notes(const std::vector<std::string>& notes, const std::string& file);

struct fit_flags {
    std::string noise_floor, saturation, current_noise, window, contact_distance;
    std::string model = "linear";  // the default of map; fit starts from "offset"
    double calibration_uncertainty = 0.0;
    double confidence = 0.95;
};

// --noise-floor, --saturation, --current-noise, --model, (with_window) --window,
// --calibration-uncertainty, --confidence and --contact-distance.
std::vector<flag> fit_flag_list(fit_flags& f, bool with_window);

// The options the flags ask for, validated by the library; a bad value is a usage error naming
// its flag (flags.hpp). command: "fit" or "map", for the flag names.
fit_options to_fit_options(const fit_flags& f, const char* command);

}  // namespace tipgap::cli
