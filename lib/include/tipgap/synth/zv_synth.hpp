#pragma once
// Synthetic constant-current z(V) traces from tipgap's exact-transmission model, for the resonance
// analysis (`tipgap synth --zv`). Nothing here is a measurement: every file written says so.
//
// Signal chain, sample k of N (biases evenly spaced from bias_from_V to bias_to_V):
//   gap          s_k = the gap where the configured junction carries current_A at V_k
//                (tipgap::solve_gap with method: exact, whatever the configured method)
//   recorded z   z_k = s_k - s_0 + z_at_first_m + z_noise_m · n_k,  n_k ~ N(0, 1)
// n_k by Box-Muller from std::mt19937_64 seeded with `seed` (as for the I(z) synthesiser).
// Truth: the sample work function, the gap at z = 0, and the maxima of the noise-free dz/dV, found
// by golden-section search on central differences of the gap (h = 10 mV) near each resonance, not
// by the analysis' own smoothing.
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "tipgap/config/config.hpp"

namespace tipgap {

struct zv_synth_options {
    double current_A = 1e-9;      // setpoint (A), > 0 (its sign follows the bias)
    double bias_from_V = 4.0;     // first bias (V), non-zero
    double bias_to_V = 10.0;      // last bias (V), same sign as bias_from_V, != bias_from_V
    std::size_t points = 121;     // samples, [8, 100000]
    double z_noise_m = 0.0;       // SD of white z noise (m), [0, 1 nm]
    double z_at_first_m = 3.2e-9; // recorded z at the first bias (m), finite: the instrument's zero is arbitrary
    std::uint64_t seed = 1;       // std::mt19937_64 seed

    // Throws tipgap::error (input) naming the field when a value is out of range, or a bias beyond
    // the model's bias limit.
    void validate(const model_options& model) const;
};

struct zv_synth_trace {
    std::vector<double> bias_V, z_m;  // the recorded trace
    std::vector<double> gap_m;        // the noise-free gap at each bias (m)
    double gap_at_z0_m = 0;           // absolute gap at z = 0 (m)
    double sample_work_function_J = 0;
    std::vector<double> peaks_V;      // maxima of the noise-free dz/dV (V), ascending
};

// Generates the trace. Deterministic for a given (config, options). Throws tipgap::error (no_answer)
// when the setpoint is unreachable at some bias.
zv_synth_trace synthesise_zv_trace(const config& c, const zv_synth_options& o);

// Writes the trace CSV ('# current:' metadata, header 'bias [V],z [nm]') and its truth YAML, both
// atomically. command_line: recorded in both files (may be empty).
void write_zv_trace(const zv_synth_trace& t, const config& c, const zv_synth_options& o, const std::string& csv_path,
                    const std::string& truth_path, const std::string& command_line = "");

// What a z(V) truth file records (the parts the demo compares with).
struct zv_truth_record {
    double sample_work_function_J = 0;
    std::vector<double> peaks_V;
};
// Reads a truth file written by write_zv_trace. Throws tipgap::error (input) naming the file and key.
zv_truth_record read_zv_truth(const std::string& path);

}  // namespace tipgap
