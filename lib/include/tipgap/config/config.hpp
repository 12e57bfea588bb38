#pragma once
// YAML configuration: the junction, the tip geometry, and input uncertainties.
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
};

// Loads and validates a config file. Unknown keys, wrong types, bad units and out-of-range values
// throw tipgap::error (input) naming file, line, column and key.
config load_config(const std::string& path);

// Same, from text; `name` is used in messages.
config parse_config(std::string_view yaml_text, const std::string& name);

// The built-in default (configs/default.yaml, embedded at build time).
config default_config();

// The materials library (configs/materials.yaml, embedded): work function and Fermi energy by name.
struct material_entry {
    std::string name;
    double work_function_J = 0;
    double fermi_energy_J = 0;
    std::string source;
};
// Throws tipgap::error (input) listing the known names when `name` is unknown.
material_entry find_material(const std::string& name, const location& where = {});
std::vector<material_entry> all_materials();

}  // namespace tipgap
