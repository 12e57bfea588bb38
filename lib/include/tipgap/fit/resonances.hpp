#pragma once
// Field-emission resonances in a measured bias trace, and the sample's local work function from them.
//
// Above the sample work function the tunnelling electron meets a triangular well between the
// barrier and the sample surface; its standing waves ("field-emission resonances") make dz/dV of a
// constant-current z(V) trace, and dI/dV measured with the feedback on, peak at a series of biases.
//
// Peaks. The trace is differentiated (z(V)) or smoothed (dI/dV) by a local least-squares cubic over
// a window of +-smoothing_half_width_V about each sample (a Savitzky-Golay filter, Savitzky & Golay
// 1964, Anal. Chem. 36, 1627, for uneven spacing). Local maxima that rise above both flanking
// minima by at least min_modulation of their height and by 6 noise standard deviations are peaks,
// numbered n = 1, 2, ... from the lowest bias (so the trace must start below the first resonance,
// i.e. below the sample work function). Each peak position is refined by a local cubic over the
// same window (z''(V) = 0, or d(dI/dV)/dV = 0) and its standard error propagated from the noise
// pooled over all windows (delta method).
//
// Work function, two ways:
//  (i) the triangular-well formula  eV_n = phi + (3 pi hbar e F / (2 sqrt(2m)))^(2/3) n^(2/3)
//      (G. Binnig et al., Phys. Rev. Lett. 55, 991 (1985); used for film work functions by C. L. Lin
//      et al., Phys. Rev. Lett. 99, 216103 (2007); both from memory), with the field F = 1/(dz/dV)
//      from a straight line through z(V) over the peaks (for dI/dV traces, F and phi are fitted
//      together to V_n against n^(2/3)). It ignores the image potential and the soft sample edge of
//      the well, so it is biased (low by ~1 eV for the lowest orders on tipgap's own model traces);
//      it is reported as a cross-check;
// (ii) a model fit: the sample work function (every other value from the configuration) whose
//      exact-transmission trace, computed at the measured biases and setpoint and passed through the
//      same peak finder, puts its peaks where the measured ones are (weighted least squares in the
//      peak positions, Gauss-Newton on phi with secant sensitivities). Its interval uses the t
//      quantile for N - 1 degrees of freedom and scales the standard error by sqrt(chi^2/(N - 1))
//      when that exceeds 1.
#include <limits>
#include <string>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/io/trace_io.hpp"

namespace tipgap {

struct resonance_options {
    double smoothing_half_width_V = 0.3;  // half width of the local-polynomial window (V), (0, 2]
    double min_modulation = 0.05;         // peak rise over its flanking minima, fraction of its height, [0, 1)
    double confidence_level = 0.95;       // of the work-function interval, [0.5, 0.9999]
    bool model_fit = true;                // false: peaks and formula only
    int max_model_traces = 10;            // model traces the fit may compute, [3, 50]
    int threads = 0;                      // workers for the model traces (0 = all cores)

    // Throws tipgap::error (input) naming the field when a value is out of range.
    void validate() const;
};

struct resonance_peak {
    int order = 0;              // n, 1 for the lowest-bias peak
    double bias_V = 0;          // peak position (V)
    double bias_stderr_V = 0;   // its standard error (V)
    double height = 0;          // smoothed dz/dV (m/V) or dI/dV (trace units) at the peak
    double modulation = 0;      // height over the deeper flanking minimum (> 1)
};

enum class resonance_status {
    ok,
    no_peaks,             // no resonance found: nothing estimated
    formula_only,         // model fit not asked for, or fewer peaks than it needs
    model_not_converged,  // max_model_traces used up; the best work function found is reported
};
const char* to_string(resonance_status s);

struct resonance_result {
    trace_kind kind = trace_kind::zv;
    double smoothing_width_V = 0;          // full width of the smoothing window (V)
    std::vector<double> bias_V;            // the trace's biases (V)
    std::vector<double> smoothed;          // dz/dV (m/V) or smoothed dI/dV at bias_V (NaN near the ends)
    std::vector<resonance_peak> peaks;

    static constexpr double nan = std::numeric_limits<double>::quiet_NaN();
    // (i) formula
    double field_V_per_m = nan, field_stderr_V_per_m = nan;
    double work_function_formula_J = nan, work_function_formula_stderr_J = nan;
    // (ii) model fit
    double work_function_J = nan, work_function_stderr_J = nan;
    double work_function_ci_low_J = nan, work_function_ci_high_J = nan;
    double confidence_level = 0.95;
    std::vector<double> model_peaks_V;     // peaks of the best model trace (V), by order
    std::vector<double> model_signal;      // model z (m, shifted onto the measured z) or dI/dV (scaled)
    std::vector<double> model_smoothed;    // its dz/dV or smoothed dI/dV
    int model_traces = 0;                  // model traces computed (the cost)

    resonance_status status = resonance_status::ok;
    std::string message;                   // empty when ok; otherwise why
};

// Peaks of one trace (no model). kind: what signal holds; bias_V ascending (V); signal: z (m) or
// dI/dV; smoothed: if not null, receives the smoothed derivative / signal at every bias (NaN within
// half a window of either end, where the window is one-sided and no peak is searched).
std::vector<resonance_peak> find_resonance_peaks(trace_kind kind, const std::vector<double>& bias_V,
                                                 const std::vector<double>& signal, const resonance_options& options,
                                                 std::vector<double>* smoothed = nullptr);

// (i): fills field and work_function_formula fields of r from r.peaks (and z for a z(V) trace).
void triangular_well_estimate(const bias_trace& trace, resonance_result& r);

// The whole analysis. c: configuration (validated; its method is replaced by `exact` for the
// model); trace: needs current_A (key "current") for the model fit.
// Throws tipgap::error (input) for a trace without a setpoint current when the model fit is asked.
resonance_result analyse_resonances(const config& c, const bias_trace& trace, const resonance_options& options = {});

}  // namespace tipgap
