#include "flags.hpp"

#include <cmath>
#include <fmt/format.h>

#include "tipgap/core/key_names.hpp"

namespace tipgap::cli {

namespace {

// Library key -> flag. command "" : every command; a command's own row comes first.
constexpr key_name flag_names[] = {
    // Operating points (predict_points, solve_gap, reference_table).
    {"", "gap", "--gap"},
    {"", "bias", "--bias"},
    {"", "current", "--current"},
    {"table", "samples", "--samples"},
    // junction_overlay (cli/shared_flags.cpp)
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

// The number of values FROM..TO in steps of `step`; a usage error when the step does not divide it.
int points_of_step(double a, double b, const std::string& step, dimension d) {
    const double h = std::abs(parse_quantity(step, d, location{"", 0, 0, "--step"}));
    const double n = std::abs(b - a) / h;
    if (!(h > 0) || !std::isfinite(n) || n > 1e6 || std::abs(n - std::round(n)) > 1e-6 * std::max(1.0, n) || std::round(n) < 1)
        throw_usage("--step", fmt::format("{} does not divide the range {:g}..{:g} into at most 1e6 equal steps; expected a "
                                          "step that does",
                                          quote_input(step), a, b));
    return static_cast<int>(std::round(n)) + 1;
}

}  // namespace

std::string_view flag_for(std::string_view command, std::string_view key) { return name_for(flag_names, command, key); }

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


std::vector<double> parse_range(std::string_view text, dimension d, int points, spacing sp, const std::string& flag,
                                const std::string& step) {
    location w;
    w.key = flag;
    std::vector<double> out;
    if (std::size_t dots = text.find(".."); dots != std::string_view::npos) {
        double a = parse_quantity(text.substr(0, dots), d, w);
        double b = parse_quantity(text.substr(dots + 2), d, w);
        if (sp == spacing::logarithmic && !(a * b > 0)) {
            throw_input(w, "a logarithmic range needs both ends non-zero and of the same sign");
        }
        if (!step.empty() && sp == spacing::linear) points = points_of_step(a, b, step, d);
        for (int i = 0; i < points; ++i) {
            double t = static_cast<double>(i) / (points - 1);
            double v = sp == spacing::linear ? a + (b - a) * t : a * std::pow(b / a, t);
            if (sp == spacing::linear && std::abs(v) <= 1e-12 * std::abs(b - a)) v = 0.0;
            out.push_back(i == points - 1 ? b : v);
        }
        return out;
    }
    std::size_t start = 0;
    while (start <= text.size()) {
        std::size_t comma = text.find(',', start);
        std::string_view item = text.substr(start, comma == std::string_view::npos ? std::string_view::npos : comma - start);
        out.push_back(parse_quantity(item, d, w));
        if (comma == std::string_view::npos) break;
        start = comma + 1;
    }
    return out;
}

std::vector<std::string> split_list(const std::string& text) {
    std::vector<std::string> out;
    for (std::size_t start = 0;;) {
        const std::size_t comma = text.find(',', start);
        out.push_back(text.substr(start, comma == std::string::npos ? std::string::npos : comma - start));
        if (comma == std::string::npos) return out;
        start = comma + 1;
    }
}

std::vector<std::pair<double, double>> all_pairs(const std::vector<double>& first, const std::vector<double>& second,
                                                 bool second_outer) {
    std::vector<std::pair<double, double>> out;
    if (second_outer) {
        for (double b : second)
            for (double a : first) out.emplace_back(a, b);
    } else {
        for (double a : first)
            for (double b : second) out.emplace_back(a, b);
    }
    return out;
}

void refuse_huge_grid(std::size_t n_first, std::size_t n_second, const char* flag) {
    // Two ranges of up to 1e6 points each would ask for 1e12 points.
    constexpr std::size_t max_points = 10'000'000;
    if (n_first * n_second > max_points) {
        throw_usage(flag, fmt::format("the grid has {} x {} = {} points; expected at most {} in one run", n_first,
                                      n_second, n_first * n_second, max_points));
    }
}

}  // namespace tipgap::cli
