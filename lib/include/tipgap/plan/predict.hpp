#pragma once
// Forward predictions at many (gap, bias) points: current density, total current, derived
// quantities and operating warnings. Parallel over points; results do not depend on thread count.
#include <string>
#include <utility>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/model/current.hpp"

namespace tipgap {

struct prediction {
    point_quantities q;                 // planar quantities (J, kappa, phi_ap, regime, ...)
    double current_A = 0;               // total current for the configured geometry (A)
    double conductance_S = 0;           // I/V (S); dI/dV at V = 0
    double conductance_G0 = 0;          // conductance_S / G0
    // ln 10 / (2 kappa) in nm: the gap change for a decade of current. 0 when kappa <= 0 (what
    // `predict` has always printed there; issues 10 and 15 revisit it, NaN would say "no value").
    double nm_per_decade = 0;
    std::vector<std::string> warnings;  // operating warnings (near contact, field emission, ...)
};

// Throws tipgap::error (input) with key `gap_key` / `bias_key` when gap_m <= 0 or |bias_V| exceeds
// the configured bias limit.
void validate_operating_point(const model_options& model, double gap_m, double bias_V, const std::string& gap_key,
                              const std::string& bias_key);

// points: (gap_m, bias_V) pairs; threads: worker count (0 = all cores).
std::vector<prediction> predict_points(const config& c, const std::vector<std::pair<double, double>>& points,
                                       int threads = 0);

}  // namespace tipgap
