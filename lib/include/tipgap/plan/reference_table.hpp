#pragma once
// The teaching table: the configured tip against sample materials from the library, with the
// textbook decay numbers next to the full model's at a reference setpoint.
#include <string>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/plan/plan.hpp"

namespace tipgap {

// The reference setpoint of the table: 1 nA at 0.1 V, a common imaging setpoint on metals (common
// practice, no source).
inline constexpr double reference_current_A = 1e-9;
inline constexpr double reference_bias_V = 0.1;

struct reference_row {
    std::string sample;                 // material name
    double sample_work_function_J = 0;  // from the materials library
    // Rectangular-barrier estimates from the mean work function phi = (phi_tip + phi_sample) / 2:
    double mean_barrier_J = 0;          // phi
    double decay_constant_per_m = 0;    // kappa = sqrt(2 m phi) / hbar
    double nm_per_decade = 0;           // ln 10 / (2 kappa), in nm
    double de_broglie_wavelength_m = 0; // h / sqrt(2 m phi), an electron with kinetic energy phi
    // Full model (image potential, geometry of the config) at the reference setpoint; NaN when the
    // setpoint cannot be reached:
    double gap_m = 0;
    double apparent_barrier_J = 0;
    double model_nm_per_decade = 0;
    std::vector<std::string> warnings;
};

// One row per sample material. c: configuration whose tip, barrier options and geometry are used;
// samples: material names (tipgap::find_material; unknown names throw tipgap::error (input) listing
// the known ones); empty: every material in the library. current_A, bias_V: the reference setpoint.
// threads: workers (0 = all cores). Throws tipgap::error (no_answer) naming the samples when the
// setpoint cannot be reached for any of them (a table of NaN would look like an answer).
std::vector<reference_row> reference_table(const config& c, const std::vector<std::string>& samples,
                                           double current_A = reference_current_A,
                                           double bias_V = reference_bias_V, const plan_options& options = {},
                                           int threads = 0);

}  // namespace tipgap
