#include "keywords.hpp"

#include <string>

#include "tipgap/core/key_names.hpp"

namespace tipgap::python {

namespace {

// Library key -> Python keyword. function "": every function; a function's own row comes first.
constexpr key_name keyword_names[] = {
    // Operating points (predict_points, solve_gap).
    {"", "gap", "gap_nm"},
    {"", "bias", "bias_V"},
    {"", "current", "current_A"},
    // uncertainty_options
    {"", "samples", "mc_samples"},
    {"", "seed", "seed"},
    {"", "threads", "threads"},
    // fit_options (fit and map)
    {"", "model", "model"},
    {"", "noise_floor_A", "noise_floor_A"},
    {"", "saturation_A", "saturation_A"},
    {"", "current_noise_A", "current_noise_A"},
    {"", "calibration_uncertainty", "calibration_uncertainty"},
    {"", "confidence_level", "confidence"},
    {"", "window_points", "window_points"},
    {"", "window_m", "window_nm"},
    {"", "contact_distance_m", "contact_distance_nm"},
    // Arrays (curve_from_arrays, grid_arrays).
    {"", "z", "z_nm"},
    {"", "x", "x_nm"},
    {"", "y", "y_nm"},
    // map_options
    {"map", "min_current_decades", "min_decades"},
    {"map", "max_relative_stderr", "max_relative_error"},
    // synth_options
    {"synth_curve", "bias_V", "bias_V"},
    {"synth_curve", "gap_min_m", "gap_nm"},
    {"synth_curve", "gap_max_m", "gap_nm"},
    {"synth_curve", "points", "points"},
    {"synth_curve", "gap_at_z0_m", "gap_at_z0_nm"},
    {"synth_curve", "current_noise_A", "noise_A"},
    {"synth_curve", "baseline_A", "baseline_A"},
    {"synth_curve", "saturation_A", "saturation_A"},
    {"synth_curve", "drift_m", "drift_nm"},
    {"synth_curve", "jump_gap_m", "jump_gap_nm"},
    {"synth_curve", "contact_conductance_G0", "contact_conductance_G0"},
    {"synth_curve", "sweeps", "sweeps"},
    // Config.replace (the keys of model_options::validate and geometry_options::validate)
    {"replace", "tip.work_function", "tip_work_function_eV"},
    {"replace", "sample.work_function", "sample_work_function_eV"},
    {"replace", "tip.fermi_energy", "tip_fermi_energy_eV"},
    {"replace", "sample.fermi_energy", "sample_fermi_energy_eV"},
    {"replace", "barrier.relative_permittivity", "relative_permittivity"},
    {"replace", "temperature", "temperature_K"},
    {"replace", "tolerance", "tolerance"},
    {"replace", "bias_limit", "bias_limit_V"},
    {"replace", "geometry.area", "area_nm2"},
    {"replace", "geometry.apex_radius", "apex_radius_nm"},
    {"replace", "geometry.contact_distance", "contact_distance_nm"},
};

}  // namespace

std::string_view keyword_for(std::string_view function, std::string_view key) {
    return name_for(keyword_names, function, key);
}

void rethrow_naming_keyword(std::string_view function, const error& e) {
    const std::string_view keyword = keyword_for(function, e.where().key);
    // A file's errors (file:line:column) name what is in the file, not a keyword.
    if (keyword.empty() || !e.where().file.empty()) throw;
    location w;
    w.key = std::string(keyword);
    throw error(e.kind(), w, e.detail());
}

}  // namespace tipgap::python
