#include "fit_flags.hpp"

#include <fmt/format.h>

#include "flags.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap::cli {

fit_options to_fit_options(const fit_flags& a, const char* command) {
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
    naming_flags(command, flag_error::usage, [&] { o.validate(); });
    return o;
}

std::vector<flag> fit_flag_list(fit_flags& f, bool with_window) {
    std::vector<flag> out = {
        {"--noise-floor", "Current below which points are noise, e.g. 2pA (default: estimated from the far tail)",
         &f.noise_floor, "CURRENT"},
        {"--saturation", "Amplifier saturation, e.g. 10nA (default: detected as a flat top)", &f.saturation, "CURRENT"},
        {"--current-noise", "Standard deviation of the current noise, e.g. 1pA, for the weights (default: estimated)",
         &f.current_noise, "CURRENT"},
        {"--model",
         "offset: I0 exp(-2 kappa z) + c over every point, weighted by the noise model sigma^2 = sigma_I^2 + (eps I)^2 "
         "estimated with the fit; linear: weighted fit of ln|I| above the noise floor (faster, no offset)",
         &f.model, "offset|linear", false, std::nullopt, f.model},
    };
    if (with_window) {
        out.push_back({"--window",
                       "Sliding window of the phi_ap(z) profile: N points or a length, e.g. 0.1nm (default: max(8, n/5) points)",
                       &f.window, "N|LENGTH"});
    }
    out.push_back({"--calibration-uncertainty",
                   "Relative piezo calibration uncertainty folded into the errors, e.g. 0.02 (default 0)",
                   &f.calibration_uncertainty, "FRACTION"});
    out.push_back({"--confidence", "Confidence level of the intervals (default 0.95)", &f.confidence, "LEVEL"});
    out.push_back({"--contact-distance", "Gap at point contact, for the absolute gap scale (default 0.25nm)",
                   &f.contact_distance, "LENGTH"});
    return out;
}

}  // namespace tipgap::cli
