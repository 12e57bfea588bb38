#include "flags.hpp"

namespace tipgap::cli {

namespace {

// Library key -> flag. command "" : every command; a command's own row comes first.
struct flag_name {
    std::string_view command, key, flag;
};
constexpr flag_name flag_names[] = {
    // Operating points (predict_points, solve_gap, reference_table).
    {"", "gap", "--gap"},
    {"", "bias", "--bias"},
    {"", "current", "--current"},
    {"table", "samples", "--samples"},
    // junction_overlay (cli/junction.cpp)
    {"", "tip.material", "--tip"},
    {"", "sample.material", "--sample"},
    {"", "tip.work_function", "--tip-work-function"},
    {"", "sample.work_function", "--sample-work-function"},
    {"", "temperature", "--temperature"},
    {"", "barrier.image_potential", "--image"},
    {"", "method", "--method"},
    // uncertainty_options
    {"", "samples", "--mc-samples"},
    // fit_options (fit and map)
    {"", "noise_floor_A", "--noise-floor"},
    {"", "saturation_A", "--saturation"},
    {"", "current_noise_A", "--current-noise"},
    {"", "calibration_uncertainty", "--calibration-uncertainty"},
    {"", "confidence_level", "--confidence"},
    {"", "window_points", "--window"},
    {"", "window_m", "--window"},
    {"", "contact_distance_m", "--contact-distance"},
    // reader_options (fit and map)
    {"", "delimiter", "--delimiter"},
    {"", "columns", "--columns"},
    {"", "z_unit", "--z-unit"},
    {"", "current_unit", "--current-unit"},
    {"", "xy_unit", "--xy-unit"},
    {"", "flip_z", "--flip-z"},
    {"", "bias_V", "--bias"},
    {"", "temperature_K", "--temperature"},
    // map_options
    {"plan", "reference_bias", "--reference-bias"},
    {"map", "min_current_decades", "--min-decades"},
    {"map", "max_relative_stderr", "--max-relative-error"},
    {"map", "threads", "--threads"},
    {"map", "range", "--range"},
    // synth_options and synth_grid_options
    {"synth", "bias_V", "--bias"},
    {"synth", "gap_min_m", "--gap"},
    {"synth", "gap_max_m", "--gap"},
    {"synth", "points", "--points"},
    {"synth", "gap_at_z0_m", "--gap-at-z0"},
    {"synth", "current_noise_A", "--noise"},
    {"synth", "baseline_A", "--baseline"},
    {"synth", "gap_jitter_m", "--gap-jitter"},
    {"synth", "drift_m", "--drift"},
    {"synth", "jump_gap_m", "--jump-gap"},
    {"synth", "contact_conductance_G0", "--contact-conductance"},
    {"synth", "sweeps", "--sweeps"},
    {"synth", "grid", "--grid"},
    {"synth", "pitch_m", "--pitch"},
    {"synth", "disc_radius_m", "--disc-radius"},
    {"synth", "disc_work_function_J", "--disc-work-function"},
    // zv_synth_options (synth --zv)
    {"synth", "current_A", "--current"},
    {"synth", "z_noise_m", "--z-noise"},
    // resonance_options
    {"resonances", "smoothing", "--smoothing"},
    {"resonances", "threads", "--threads"},
};

}  // namespace

std::string_view flag_for(std::string_view command, std::string_view key) {
    for (const flag_name& f : flag_names)
        if (f.command == command && f.key == key) return f.flag;
    for (const flag_name& f : flag_names)
        if (f.command.empty() && f.key == key) return f.flag;
    return {};
}

void rethrow_naming_flag(std::string_view command, flag_error as, const error& e) {
    const std::string_view flag = flag_for(command, e.where().key);
    if (flag.empty()) throw;
    location w;
    w.key = std::string(flag);
    throw error(as == flag_error::usage ? error_kind::usage : e.kind(), w, e.detail());
}

double flag_quantity(const std::string& text, dimension d, const char* flag) {
    try {
        return parse_quantity(text, d, location{});
    } catch (const error& e) {
        throw_usage(flag, e.detail());
    }
}

}  // namespace tipgap::cli
