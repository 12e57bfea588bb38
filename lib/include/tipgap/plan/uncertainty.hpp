#pragma once
// Propagation of input uncertainties (config.sigma: tip and sample work function, apex radius) to the
// outputs of plan and predict, by seeded Monte Carlo (JCGM 101:2008, "GUM Supplement 1") and by
// linear propagation with finite-difference sensitivities (JCGM 100:2008, GUM, eq. 10).
#include <cstdint>
#include <functional>
#include <limits>
#include <string>
#include <utility>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/plan/plan.hpp"

namespace tipgap {

// The physical range of the uncertain inputs: Monte Carlo draws outside it are drawn again (a
// normal distribution truncated to the range). A work function below 1 eV or a tip apex below
// 0.1 nm (smaller than an atom) is not a metal tip; common practice, no source. The upper ends are
// the model's own limits.
inline constexpr double uncertain_work_function_min_J = 1.0 * si::electron_volt;
inline constexpr double uncertain_work_function_max_J = 20.0 * si::electron_volt;
inline constexpr double uncertain_apex_radius_min_m = 0.1e-9;
inline constexpr double uncertain_apex_radius_max_m = 1e-5;

struct uncertainty_options {
    int samples = 400;       // Monte Carlo draws, [0, 1000000]; 0: linear propagation only
    std::uint64_t seed = 1;  // seed of the std::mt19937_64 stream; same seed, same draws, same result
    bool linear = true;      // also propagate linearly (2 extra evaluations per uncertain input)
    int threads = 0;         // workers for the draws (0 = all cores); results do not depend on it

    // Throws tipgap::error (input) naming the field when a value is out of range.
    void validate() const;
};

// One output with its uncertainty. NaN marks what was not computed.
struct uncertain_value {
    double value = std::numeric_limits<double>::quiet_NaN();      // at the nominal inputs
    // Monte Carlo: mean, standard deviation (n - 1) and the probabilistically symmetric 95 %
    // coverage interval (2.5 % and 97.5 % quantiles, JCGM 101 §7.7; quantile definition 7 of
    // Hyndman & Fan 1996, as numpy's default).
    double mc_mean = std::numeric_limits<double>::quiet_NaN();
    double mc_stddev = std::numeric_limits<double>::quiet_NaN();
    double ci95_low = std::numeric_limits<double>::quiet_NaN();
    double ci95_high = std::numeric_limits<double>::quiet_NaN();
    // Linear: u = sqrt(sum (df/dx_i u_i)^2), and value ± 1.96 u.
    double linear_stddev = std::numeric_limits<double>::quiet_NaN();
    double linear_ci95_low = std::numeric_limits<double>::quiet_NaN();
    double linear_ci95_high = std::numeric_limits<double>::quiet_NaN();
    int valid_samples = 0;   // draws that gave a finite value
};

struct uncertainty_summary {
    std::vector<std::string> names;       // one per output, e.g. "gap_nm"
    std::vector<uncertain_value> values;  // same order
    std::vector<std::string> inputs;      // uncertain inputs used, e.g. "tip.work_function"
    int samples = 0;                      // Monte Carlo draws evaluated
    std::uint64_t seed = 0;
    int redrawn = 0;                      // draws outside the physical range, drawn again
    int failed = 0;                       // draws where an output had no value (e.g. unreachable)
};

// The outputs as a function of the configuration; a non-finite entry means "no value".
using output_function = std::function<std::vector<double>(const config&)>;

// Propagates c.sigma through f. names: one per entry of f's result. The apex radius counts only for
// the paraboloid geometry. With no uncertain input the summary holds the nominal values only.
// Throws tipgap::error (input) for bad options; exceptions from f propagate.
uncertainty_summary propagate_uncertainty(const config& c, const std::vector<std::string>& names,
                                          const output_function& f, const uncertainty_options& options);

// plan at one setpoint: gap_nm, nm_per_decade, apparent_barrier_eV (the conductance and resistance
// are fixed by the setpoint itself). Arguments as for plan_setpoint.
uncertainty_summary plan_uncertainty(const config& c, double current_A, double bias_V, const plan_options& plan,
                                     const uncertainty_options& options);

// predict at one point: current_A, conductance_G0, nm_per_decade, apparent_barrier_eV.
// gap_m: s (m), > 0; bias_V: sample bias (V).
uncertainty_summary predict_uncertainty(const config& c, double gap_m, double bias_V,
                                        const uncertainty_options& options);

// Many points at once: one summary per point, each empty (no inputs) when c has no input
// uncertainties (c.sigma.any() false) and, for plan, at an unreachable setpoint.
// points: (gap_m, bias_V) pairs as for predict_uncertainty.
std::vector<uncertainty_summary> predict_uncertainties(const config& c, const std::vector<std::pair<double, double>>& points,
                                                       const uncertainty_options& options);
// points: plan_setpoints' result; plan: the options it was made with.
std::vector<uncertainty_summary> plan_uncertainties(const config& c, const std::vector<plan_point>& points,
                                                    const plan_options& plan, const uncertainty_options& options);

}  // namespace tipgap
