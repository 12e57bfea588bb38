#pragma once
// The main job, `tipgap demo`: predictions for the built-in config, fits of every curve in the
// synthetic demo_scans/ set, and their comparison with the ground truth the synthesiser wrote.
// Computation only; the CLI formats and writes the report.
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/io/reader_options.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/fit/resonances.hpp"
#include "tipgap/fit/model_fit.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/predict.hpp"
#include "tipgap/synth/synth.hpp"
#include "tipgap/synth/zv_synth.hpp"

namespace tipgap {

struct demo_options {
    // Directory of curves (*.csv, *.tsv, *.txt), each with an optional <stem>.truth.yaml and, for a
    // file in another layout, <stem>.read.yaml: the reader options it is read with
    // (load_reader_options). A curve is fitted with the linear model unless its <stem>.fit.yaml
    // says `model: offset` (the only key).
    std::string scans_dir;
    double bias_V = 0.1;            // bias of the prediction sweep (V)
    double gap_min_m = 0.3e-9;      // prediction sweep (m), 0 < min < max
    double gap_max_m = 1.5e-9;
    int gap_points = 25;            // [2, 10000]
    // Fit the model (mean work function, gap offset) to each sweep fitted with the linear model
    // (the model comparison fits no current offset, so offset-model curves are left out).
    bool model_comparison = true;
    bool resonances = true;         // analyse the z(V) traces in <scans_dir>/resonances/, if any
    int threads = 0;                // 0 = all cores
};

struct demo_curve {
    std::shared_ptr<const measured_curve> curve;
    reader_options read;                     // how the file was read (from <stem>.read.yaml)
    std::size_t sweep_index = 0;
    fit_result fit;
    std::optional<model_fit_result> model;
    std::optional<truth_record> truth;       // when <stem>.truth.yaml exists
    std::optional<synth_sweep_truth> sweep_truth;
    // κ truth (the expected value, with the instrument's drift and baseline) inside the fit's
    // confidence interval at fit.confidence_level.
    // truth_decay_constant_per_m: the expected κ for the linear model; for the offset model the
    // model's own κ over the same points (drift-free, without the baseline it removes), 1/m.
    double truth_decay_constant_per_m = 0.0;
    bool kappa_within = false;
    // Offset model only: the synthesiser's baseline inside the offset's interval (± t · stderr).
    bool offset_within = false;
    // Same test for the mean work function of the model comparison (interval: ± t · stderr).
    bool work_function_within = false;

    const curve_sweep& sweep() const { return curve->sweeps[sweep_index]; }
};

// One synthetic z(V) trace of <scans_dir>/resonances/ and its resonance analysis.
struct demo_resonance {
    std::shared_ptr<const bias_trace> trace;
    resonance_result result;
    std::optional<zv_truth_record> truth;  // when <stem>.truth.yaml exists
    bool work_function_within = false;     // truth inside the fit's interval
    double largest_peak_error_V = 0;       // over the peaks found and in the truth, by order
};

struct demo_report {
    config cfg;                                  // the built-in default
    std::vector<prediction> sweep;               // gap sweep at options.bias_V
    std::vector<demo_curve> curves;              // in file-name order, sweeps in file order
    // Setpoint ladder at options.bias_V (10 pA .. 10 nA, one per decade): how far the tip sits.
    std::vector<plan_point> plan;
    std::vector<std::string> files_without_truth;
    std::vector<demo_resonance> resonances;      // in file-name order
};

// Throws tipgap::error (input) when the directory is missing or holds no curve files; a bad curve
// file or reader options file throws with its file:line:column.
demo_report run_demo(const demo_options& options);

}  // namespace tipgap
