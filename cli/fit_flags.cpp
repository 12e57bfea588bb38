// Fit flags shared by tipgap fit and tipgap map.
#include "fit_flags.hpp"

#include <fmt/format.h>
#include <utility>

#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap::cli {

// Flag values are parsed by the library's unit parser; its errors become usage errors that name
// the flag.
double flag_quantity(const std::string& text, dimension d, const char* flag) {
    try {
        return parse_quantity(text, d, location{"", 0, 0, ""});
    } catch (const error& e) {
        throw_usage(flag, e.detail());
    }
}

fit_options to_fit_options(const fit_flags& a) {
    fit_options o;
    if (!from_string(a.model, o.model)) throw_usage("--model", fmt::format("expected {}, got '{}'", accepted_names<fit_model>(), a.model));
    if (!a.noise_floor.empty()) o.noise_floor_A = flag_quantity(a.noise_floor, dimension::current, "--noise-floor");
    if (!a.saturation.empty()) o.saturation_A = flag_quantity(a.saturation, dimension::current, "--saturation");
    if (!a.current_noise.empty())
        o.current_noise_A = flag_quantity(a.current_noise, dimension::current, "--current-noise");
    if (!a.contact_distance.empty())
        o.contact_distance_m = flag_quantity(a.contact_distance, dimension::length, "--contact-distance");
    if (!a.window.empty()) {
        // A bare integer counts points; a value with a length unit is a z extent.
        const bool has_unit = a.window.find_first_not_of("0123456789 ") != std::string::npos;
        if (has_unit) {
            o.window_m = flag_quantity(a.window, dimension::length, "--window");
        } else {
            try {
                o.window_points = static_cast<std::size_t>(std::stoul(a.window));
            } catch (const std::exception&) {
                throw_usage("--window", fmt::format("'{}' is not a number of points", a.window));
            }
        }
    }
    o.calibration_uncertainty = a.calibration_uncertainty;
    o.confidence_level = a.confidence;
    try {
        o.validate();
    } catch (const error& e) {
        // Name the flag, not the options field.
        static const std::pair<const char*, const char*> flags[] = {
            {"noise_floor_A", "--noise-floor"},     {"saturation_A", "--saturation"},
            {"current_noise_A", "--current-noise"}, {"calibration_uncertainty", "--calibration-uncertainty"},
            {"confidence_level", "--confidence"},   {"window_points", "--window"},
            {"window_m", "--window"},               {"contact_distance_m", "--contact-distance"}};
        std::string flag = e.where().key;
        for (const auto& [field, name] : flags) {
            if (flag == field) flag = name;
        }
        throw_usage(flag, e.detail());
    }
    return o;
}

void add_fit_flags(CLI::App* cmd, fit_flags& f, bool with_window) {
    cmd->add_option("--noise-floor", f.noise_floor,
                    "Current below which points are noise, e.g. 2pA (default: estimated from the far tail)")
        ->type_name("CURRENT");
    cmd->add_option("--saturation", f.saturation,
                    "Amplifier saturation, e.g. 10nA (default: detected as a flat top)")
        ->type_name("CURRENT");
    cmd->add_option("--current-noise", f.current_noise,
                    "Standard deviation of the current noise, e.g. 1pA, for the weights (default: estimated)")
        ->type_name("CURRENT");
    cmd->add_option("--model", f.model, "linear: weighted fit of ln|I|; offset: I0 exp(-2 kappa z) + c")
        ->type_name("linear|offset")
        ->default_str("linear");
    if (with_window) {
        cmd->add_option("--window", f.window,
                        "Sliding window of the phi_ap(z) profile: N points or a length, e.g. 0.1nm (default: max(8, n/5) points)")
            ->type_name("N|LENGTH");
    }
    cmd->add_option("--calibration-uncertainty", f.calibration_uncertainty,
                    "Relative piezo calibration uncertainty folded into the errors, e.g. 0.02 (default 0)")
        ->type_name("FRACTION");
    cmd->add_option("--confidence", f.confidence, "Confidence level of the intervals (default 0.95)")
        ->type_name("LEVEL");
    cmd->add_option("--contact-distance", f.contact_distance,
                    "Gap at point contact, for the absolute gap scale (default 0.25nm)")
        ->type_name("LENGTH");
}

}  // namespace tipgap::cli
