#pragma once
// YAML configuration: the junction, the tip geometry, and input uncertainties.
#include <functional>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tipgap/model/geometry.hpp"
#include "tipgap/model/model.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap {

// Standard uncertainties given as "value ± sigma" in the config (SI; 0 = exact).
struct input_uncertainties {
    double tip_work_function_J = 0.0;
    double sample_work_function_J = 0.0;
    double apex_radius_m = 0.0;
    bool any() const { return tip_work_function_J > 0 || sample_work_function_J > 0 || apex_radius_m > 0; }
};

struct config {
    std::string source;  // file path, or "<default>" for the built-in configuration
    model_options model;
    geometry_options geometry;
    input_uncertainties sigma;
    // source: "FILE" or "<default>", followed by " + command line" after apply_overlay.
    // Where each value came from, by config key ("tip.work_function", "temperature", ...):
    // "built-in default", "FILE:LINE", or what apply_overlay was told ("command line").
    std::map<std::string, std::string> origin;
};

// Loads and validates a config file. A file states only what differs from the built-in default:
// every key it gives replaces the default's (precedence: built-in default < config file < command
// line, see apply_overlay). Unknown keys, wrong types, bad units and out-of-range values throw
// tipgap::error (input) naming file, line, column and key.
config load_config(const std::string& path);

// Same, from text; `name` is used in messages.
config parse_config(std::string_view yaml_text, const std::string& name);

// The built-in default (configs/default.yaml, embedded at build time): a tungsten tip over a gold
// sample whose numbers come from the materials library.
config default_config();

// Values given on top of a config (the command line's junction flags). Unset fields keep the
// config's value. A material sets the electrode's work function and Fermi energy from the library;
// a work function given with it (or alone) replaces the library's; a work function alone makes the
// electrode "custom" (no material name).
struct junction_overlay {
    std::string tip_material, sample_material;     // library name or alias, any case ("W", "Au")
    std::optional<double> tip_work_function_J;     // J, (0, 20 eV]
    std::optional<double> sample_work_function_J;  // J, (0, 20 eV]
    std::optional<double> temperature_K;           // K, [0, 2000]
    std::optional<image_kind> image;
    std::optional<method_kind> method;
};

// The overlay of values given as text, "" for not given: materials by name or alias, energies and
// the temperature with units ("4.3eV", "300K"), image potential and method by name. Errors name
// the config key ("tip.work_function", "temperature", "barrier.image_potential", "method").
struct junction_text {
    std::string tip = "", sample = "", tip_work_function = "", sample_work_function = "", temperature = "", image = "",
                method = "";
};
junction_overlay parse_overlay(const junction_text& t);

// Applies `o` to `c`, records `origin` for every key it sets, and validates the model (errors name
// the config key: "tip.work_function", "temperature", "tip.material", ...). flag_of, when given,
// names the source of each overlay field (its neutral key: "tip.material", "tip.work_function",
// "sample.material", "sample.work_function", "temperature", "barrier.image_potential", "method"),
// and the origin reads "ORIGIN (NAME)", e.g. "command line (--tip)".
void apply_overlay(config& c, const junction_overlay& o, const std::string& origin,
                   const std::function<std::string(std::string_view)>& flag_of = nullptr);

// The config as YAML that parse_config reads back as the same config, each value followed by a
// comment naming its origin ("# built-in default", "# my.yaml:3", "# command line").
std::string config_yaml(const config& c);

// The materials library (configs/materials.yaml, embedded): work function and Fermi energy by name.
struct material_entry {
    std::string name;
    double work_function_J = 0;
    double fermi_energy_J = 0;
    std::string source;
    std::vector<std::string> aliases;  // chemical symbols and common names ("W", "Au", "HOPG")
};
// The entry whose name or alias matches `name`, ignoring case, '-', '_', '/' and spaces ("Pt-Ir",
// "PtIr" and "platinum_iridium" are one material). Throws tipgap::error (input) listing the known
// names when none does.
material_entry find_material(const std::string& name, const location& where = {});
std::vector<material_entry> all_materials();

}  // namespace tipgap
