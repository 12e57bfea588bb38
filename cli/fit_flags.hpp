#pragma once
// The fit options of `tipgap fit`, shared with `tipgap map`: one set of flag names, help texts
// and messages.
#include <CLI/CLI.hpp>
#include <string>

#include "tipgap/fit/fit.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap::cli {

struct fit_flags {
    std::string noise_floor, saturation, current_noise, window, contact_distance;
    std::string model = "linear";
    double calibration_uncertainty = 0.0;
    double confidence = 0.95;
};

// Adds --noise-floor, --saturation, --current-noise, --model, --calibration-uncertainty,
// --confidence, --contact-distance and (with_window) --window to `cmd`.
void add_fit_flags(CLI::App* cmd, fit_flags& f, bool with_window);

// The options the flags ask for; throws tipgap::error (usage) naming the flag.
fit_options to_fit_options(const fit_flags& f);

// A flag value with a unit, parsed by the library; its errors become usage errors naming `flag`.
double flag_quantity(const std::string& text, dimension d, const char* flag);

}  // namespace tipgap::cli
