#pragma once
// Many curves: the weighted mean and spread of κ and φ_ap over several fitted sweeps, and the
// difference between approach and retract sweeps with its significance (hysteresis, drift).
//
// Weighted mean x̄ = Σ w x / Σ w with w = 1/σ², standard error 1/sqrt(Σ w), scaled by the Birge
// ratio R = sqrt(Σ w (x - x̄)² / (N - 1)) when R > 1 (the curves scatter more than their own
// errors say: R. T. Birge, Phys. Rev. 40, 207 (1932); the practice of the CODATA adjustments).
// Approach − retract: d = x̄_a − x̄_r with σ_d = sqrt(σ_a² + σ_r²), two-sided p = 2 (1 − Φ(|d|/σ_d)).
#include <cstddef>
#include <span>
#include <string>
#include <vector>

#include "tipgap/fit/fit.hpp"
#include "tipgap/io/columns.hpp"

namespace tipgap {

struct weighted_mean {
    double mean = 0.0;          // SI
    double standard_error = 0.0;  // standard error, Birge-scaled when birge_ratio > 1, SI
    double birge_ratio = 0.0;   // sqrt(χ²/(N - 1)); NaN for one value
    double spread = 0.0;        // sample standard deviation of the values, SI (NaN for one)
    std::size_t count = 0;
};

// values and standard errors (each > 0 and finite; others are skipped), the same length.
weighted_mean combine_weighted(std::span<const double> values, std::span<const double> stderrs);

struct fit_summary {
    weighted_mean decay_constant_per_m;     // κ over every sweep, 1/m
    weighted_mean apparent_barrier_J;       // φ_ap over every sweep, J
    weighted_mean approach_decay_per_m;     // κ over approach sweeps (count 0: none)
    weighted_mean retract_decay_per_m;      // κ over retract sweeps (count 0: none)
    double hysteresis_per_m = 0.0;          // κ approach − κ retract, 1/m (NaN without both)
    double hysteresis_stderr_per_m = 0.0;   // 1/m
    double hysteresis_p_value = 0.0;        // two-sided, normal; NaN without both
};

// The summary of several fitted sweeps (>= 1).
fit_summary summarise_fits(std::span<const fit_result> fits);

// Columns of the summary (JSON "summary") and its text under the table.
const std::vector<column<fit_summary>>& fit_summary_columns();
std::string describe_summary(const fit_summary& s);

}  // namespace tipgap
