#pragma once
// The fit options of `tipgap fit`, shared with `tipgap map`: one set of flag names, help texts
// and messages.
#include <string>
#include <vector>

#include "command.hpp"
#include "tipgap/fit/fit.hpp"

namespace tipgap::cli {

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
