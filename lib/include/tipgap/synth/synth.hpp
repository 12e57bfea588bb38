#pragma once
// Synthetic I(z) curves from tipgap's own model, with a documented instrument model, for demos and
// tests. Nothing here is a measurement: every file written says so in its metadata.
//
// Signal chain, sample k of N in the file (k counts through approach and retract sweeps):
//   nominal gap     s_k                  from the sweep schedule, gap_min..gap_max
//   recorded z      z_k = s_k - gap_at_z0                      (z zero arbitrary, as on a piezo)
//   true gap        s_true = s_k + drift · k/(N-1) + σ_z · m_k (piezo drift, linear in time; gap
//                                                              jitter m_k ~ N(0, 1) from vibration
//                                                              or feedback: noise ∝ the current)
//   model current   I_m = total_current(config, s_true, V)     (tipgap's planar WKB model)
//   contact         I_m = G_c · G0 · V when s_true < jump_gap  (jump to a conductance plateau)
//   noise floor     I = I_m + baseline + σ · n_k,  n_k ~ N(0, 1) (white amplifier noise)
//   saturation      I = clamp(I, -I_sat, +I_sat)               (amplifier rails)
// n_k are standard normal deviates by Box-Muller from std::mt19937_64 seeded with `seed`, whose
// output the C++ standard fixes, so a seed gives the same file with any standard library.
#include <cstddef>
#include <cstdint>
#include <limits>
#include <string>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/io/curve_io.hpp"

namespace tipgap {

enum class synth_sweeps {
    retract,           // one sweep, z increasing
    approach,          // one sweep, z decreasing
    approach_retract,  // approach then retract, with a direction column
};
template <>
struct enum_names<synth_sweeps> {
    static constexpr enum_name<synth_sweeps> table[] = {{synth_sweeps::retract, "retract"},
                                                        {synth_sweeps::approach, "approach"},
                                                        {synth_sweeps::approach_retract, "approach_retract"}};
};

// Limits of synth_options::validate: the narrowest gap range (m), and the largest noise or
// baseline current (A; an STM current amplifier saturates far below).
constexpr double min_gap_span_m = 10e-12;
constexpr double max_synth_current_A = 1e-3;

struct synth_options {
    double bias_V = 0.1;                    // sample bias (V), non-zero, |V| <= model bias limit
    double gap_min_m = 0.45e-9;             // closest nominal gap (m), > 0
    double gap_max_m = 1.0e-9;              // farthest nominal gap (m), > gap_min_m
    std::size_t points = 121;               // samples per sweep, [8, 1e6]
    // Absolute gap at z = 0 (m): z = s - gap_at_z0_m. NaN: gap_min_m (z starts at 0).
    double gap_at_z0_m = std::numeric_limits<double>::quiet_NaN();
    synth_sweeps sweeps = synth_sweeps::retract;
    double current_noise_A = 0.0;           // σ of the white current noise (A), >= 0
    double baseline_A = 0.0;                // additive offset of the noise floor (A), signed, finite
    double gap_jitter_m = 0.0;              // σ_z of a Gaussian jitter of the gap per point (m), [0, 0.1 nm]
    double saturation_A = 0.0;              // amplifier clip level (A), >= 0; 0 = no clipping
    double drift_m = 0.0;                   // piezo drift over the whole file (m), |drift| < 1 nm
    double jump_gap_m = 0.0;                // contact jump below this true gap (m), >= 0; 0 = none
    double contact_conductance_G0 = 1.0;    // plateau conductance after the jump (G0), (0, 100]
    std::uint64_t seed = 1;                 // std::mt19937_64 seed
    std::string tip_label;                  // free text for `# tip:` (default: from the config)
    std::string sample_label;               // free text for `# sample:` (default: from the config)

    // Throws tipgap::error (input) naming the field when a value is out of range.
    void validate(const model_options& model) const;
};

// What an ideal linear fit of ln|I| would see on one sweep: the noise-free recorded current
// I_m + baseline (with the drift, no noise, no clipping) fitted over the points the fitter can use
// (|I_m + baseline| above the noise floor |baseline| + 3σ, below the saturation, outside contact),
// weighted by its square. `model` is the same fit drift-free and without the baseline: the
// physics alone; `expected` adds the instrument's systematic effects (drift, baseline), which a
// linear fit does not remove.
struct synth_sweep_truth {
    sweep_direction direction = sweep_direction::retract;
    std::size_t first_row = 0, rows = 0;
    std::size_t usable_points = 0;
    double decay_constant_expected_per_m = 0.0;  // with the drift, as the fit should find it
    double decay_constant_model_per_m = 0.0;     // same points, drift-free: the model's own value
    double apparent_barrier_expected_J = 0.0;
    double apparent_barrier_model_J = 0.0;
};

struct synth_truth {
    double tip_work_function_J = 0, sample_work_function_J = 0, mean_work_function_J = 0;
    double gap_at_z0_m = 0;
    // Model over the whole gap range, drift-free: slope of ln|I_m| against s (equal weights) and
    // the local κ(s) = -½ d ln|I|/ds at the ends (central difference, h = 2 pm).
    double decay_constant_range_per_m = 0, apparent_barrier_range_J = 0;
    double decay_constant_at_gap_min_per_m = 0, decay_constant_at_gap_max_per_m = 0;
    double apparent_barrier_at_gap_min_J = 0, apparent_barrier_at_gap_max_J = 0;
    double current_at_gap_min_A = 0, current_at_gap_max_A = 0;  // model, signed
    double noise_floor_A = 0;                                   // |baseline| + 3σ
    double jump_z_m = std::numeric_limits<double>::quiet_NaN();  // z of the jump (drift-free), or NaN
    std::vector<synth_sweep_truth> sweeps;
};

struct synth_sample {
    double z_m = 0;             // recorded z (m)
    double current_A = 0;       // "measured" current (A)
    double true_gap_m = 0;      // gap the model saw (m)
    double model_current_A = 0; // noise-free current (A), before contact, floor and clipping
    sweep_direction direction = sweep_direction::retract;
    bool in_contact = false;
};

struct synth_curve {
    std::vector<synth_sample> samples;  // file order
    synth_truth truth;
};

// Generates one curve. Deterministic for a given (config, options).
synth_curve synthesise_curve(const config& c, const synth_options& o);

// Writes the curve CSV (`# key: value` metadata, header `z [nm],current [pA]` and `,direction` for
// an approach/retract pair) and the ground truth YAML at truth_path, both atomically.
// command_line: recorded in both files (may be empty).
void write_synth_curve(const synth_curve& curve, const config& c, const synth_options& o, const std::string& csv_path,
                       const std::string& truth_path, const std::string& command_line = "");

// The truth file beside a curve: "<dir>/<stem>.truth.yaml" for "<dir>/<stem>.csv".
std::string truth_path_for(const std::string& csv_path);

// ---------------------------------------------------------------------------------------------
// Grids: one retract curve per pixel, written as one long CSV for `tipgap map`.
enum class grid_pattern {
    uniform,  // the config's sample everywhere
    disc,     // a disc of another sample work function on the uniform background
};
template <>
struct enum_names<grid_pattern> {
    static constexpr enum_name<grid_pattern> table[] = {{grid_pattern::uniform, "uniform"}, {grid_pattern::disc, "disc"}};
};

struct synth_grid_options {
    std::size_t nx = 64, ny = 64;           // pixels, each in [1, 4096]
    double pitch_m = 1e-9;                  // pixel spacing (m), > 0; pixel (ix, iy) at (ix, iy)·pitch
    grid_pattern pattern = grid_pattern::disc;
    double disc_radius_m = std::numeric_limits<double>::quiet_NaN();  // NaN: a quarter of the shorter side
    double disc_centre_x_m = std::numeric_limits<double>::quiet_NaN(); // NaN: grid centre
    double disc_centre_y_m = std::numeric_limits<double>::quiet_NaN();
    double disc_work_function_J = 4.3 * si::electron_volt;  // sample work function inside the disc (J)

    void validate() const;
};

struct grid_region_truth {
    std::string name;                      // "background", "disc"
    double sample_work_function_J = 0, mean_work_function_J = 0;
    double decay_constant_range_per_m = 0, apparent_barrier_range_J = 0;  // as synth_truth
    double decay_constant_expected_per_m = 0, apparent_barrier_expected_J = 0;  // as synth_sweep_truth
    std::size_t pixels = 0;
};

struct synth_grid_truth {
    std::vector<grid_region_truth> regions;
    double disc_radius_m = 0, disc_centre_x_m = 0, disc_centre_y_m = 0;
    std::size_t rows = 0;
    double noise_floor_A = 0;
};

// Streams the grid CSV (header `x [nm],y [nm],z [nm],current [pA]`, pixels in row-major order
// iy then ix, each pixel's samples together, z increasing) and its truth YAML, both atomically.
// The model is evaluated once per region (the curve shape depends only on the region's work
// function); each pixel only adds noise, floor and clipping. Memory does not grow with the grid.
// o.drift_m and o.sweeps other than retract are rejected (input error) in grid mode.
synth_grid_truth write_synth_grid(const config& c, const synth_options& o, const synth_grid_options& g,
                                  const std::string& csv_path, const std::string& truth_path,
                                  const std::string& command_line = "");

// Reads the ground truth a synth run wrote (the subset `tipgap demo` compares with).
struct truth_record {
    std::string file;
    std::uint64_t seed = 0;
    double bias_V = 0;
    double current_noise_A = 0, baseline_A = 0, saturation_A = 0, drift_m = 0, jump_gap_m = 0;
    double mean_work_function_J = 0, gap_at_z0_m = 0;
    double jump_z_m = std::numeric_limits<double>::quiet_NaN();
    std::vector<synth_sweep_truth> sweeps;
};
// Throws tipgap::error (input) naming file and key on a missing or malformed entry.
truth_record read_truth(const std::string& path);

}  // namespace tipgap
