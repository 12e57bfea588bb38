#include "shared_flags.hpp"

#include <cstdio>
#include <fmt/format.h>

#include "flags.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap::cli {

config load_junction(const junction_flags& j) {
    config c = j.config_path.empty() ? default_config() : load_config(j.config_path);
    const auto flag_of = [](std::string_view key) { return std::string(flag_for("", key)); };
    naming_flags("", flag_error::usage, [&] { apply_overlay(c, parse_overlay(j.text), "command line", flag_of); });
    return c;
}

std::vector<flag> junction_flag_list(junction_flags& j) {
    std::vector<flag> out = {
        {"--config,-c", "Junction configuration (YAML) stating what differs from the built-in default", &j.config_path, "FILE"},
        {"--tip,--tip-material", "Tip material by name or symbol (W, PtIr, Au, ...; default tungsten)", &j.text.tip, "MATERIAL"},
        {"--sample,--sample-material", "Sample material by name or symbol (Au, HOPG, Cu, ...; default gold)", &j.text.sample,
         "MATERIAL"},
        {"--tip-work-function", "Tip work function, e.g. 4.3eV (overrides the material's)", &j.text.tip_work_function, "ENERGY"},
        {"--sample-work-function", "Sample work function, e.g. 4.3eV (overrides the material's)", &j.text.sample_work_function,
         "ENERGY"},
        {"--temperature", "Temperature, e.g. 300K (default 4.2K)", &j.text.temperature, "TEMPERATURE"},
        {"--image", "Image potential: " + accepted_names<image_kind>() + " (default exact)", &j.text.image, "KIND"},
        {"--method", "Transmission: " + accepted_names<method_kind>() + " (default wkb)", &j.text.method, "KIND"},
        {"--show-config", "Print the merged configuration (YAML, each value's origin as a comment) and stop", &j.show},
    };
    out.back().then = [&j] {
        fmt::print("{}", config_yaml(load_junction(j)));
        throw finished{};
    };
    return out;
}

reader_options to_reader_options(const read_flags& f, const char* command, std::size_t roles) {
    reader_options o;
    if (!f.delimiter.empty() && !from_string(f.delimiter, o.delimiter))
        throw_usage("--delimiter", fmt::format("{} is not a delimiter; expected {}", quote_input(f.delimiter),
                                               accepted_names<delimiter_choice>()));
    if (!f.columns.empty()) o.columns = split_list(f.columns);
    o.z_unit = f.z_unit;
    o.current_unit = f.current_unit;
    o.xy_unit = f.xy_unit;
    o.flip_z = f.flip_z;
    if (!f.bias.empty()) o.bias_V = flag_quantity(f.bias, dimension::voltage, "--bias");
    if (!f.temperature.empty()) o.temperature_K = flag_quantity(f.temperature, dimension::temperature, "--temperature");
    naming_flags(command, flag_error::usage, [&] { o.validate(roles); });
    return o;
}

std::vector<flag> read_flag_list(read_flags& f, bool grid) {
    std::vector<flag> out = {
        {"--delimiter", "Cell separator: comma, tab, semicolon or space (runs of whitespace) (default: detected from the header row)",
         &f.delimiter, "comma|tab|semicolon|space"},
        {"--columns",
         grid ? "Columns of x, y, z and current: header names (any case, without unit) or 1-based indices, e.g. X,Y,Z,I "
                "or 1,2,3,4 (default: the columns named x, y, z and current or I)"
              : "Columns of z and current: header names (any case, without unit) or 1-based indices, e.g. Z,I or 2,3 "
                "(default: the columns named z and current or I); other columns are ignored",
         &f.columns, grid ? "X,Y,Z,I" : "Z,I"},
        {"--z-unit", "Unit of the z column when the header gives none or no header exists, e.g. nm (overrides the header's)",
         &f.z_unit, "UNIT"},
        {"--current-unit", "Unit of the current column when the header gives none, e.g. pA (overrides the header's)",
         &f.current_unit, "UNIT"},
    };
    if (grid) {
        out.push_back({"--xy-unit", "Unit of the x and y columns when the header gives none, e.g. nm (overrides the header's)",
                       &f.xy_unit, "UNIT"});
    }
    out.push_back({"--flip-z", "z in the file grows as the tip approaches: read it as -z (fits need z growing as the tip retracts)",
                   &f.flip_z});
    out.push_back({"--bias", "Bias for files without '# bias:', e.g. 100mV; a file stating another value is overridden, with a note",
                   &f.bias, "VOLTAGE"});
    out.push_back({"--temperature",
                   "Temperature for files without '# temperature:', e.g. 4.2K; a file stating another value is overridden, "
                   "with a note",
                   &f.temperature, "TEMPERATURE"});
    return out;
}

void print_notes(const std::vector<std::string>& notes, const std::string& file) {
    for (const std::string& n : notes) fmt::print(stderr, "tipgap: note: {}: {}\n", file, n);
}

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
