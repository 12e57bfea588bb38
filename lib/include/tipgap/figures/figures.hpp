#pragma once
// The figures of `plan` and `predict`: the curves are computed here from the model (physics), then
// handed to tipgap::plot (drawing only). Current against gap on a log axis, current against bias,
// the constant-current trace z(V), apparent barrier height against gap, and for a (gap, bias) grid a
// colour map of log10 |I|.
#include <optional>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plot/plot.hpp"
#include "tipgap/plan/predict.hpp"

namespace tipgap {

// What the plan and predict figures show beyond the data.
struct figure_options {
    // Smallest |current| drawn on a log current axis (A), > 0: curves fall to 1e-17 A at wide gaps,
    // far below any current amplifier, and would stretch the axis over decades nobody measures.
    double current_floor_A = 1e-15;
    // plan: the bias (V) of the side panels I(s), phi_ap(s) and I(V); they use the reachable
    // setpoint nearest to it. Default: the first reachable setpoint.
    std::optional<double> side_bias_V;
    // Throws tipgap::error (input) naming the key "current_floor" or "plot_bias".
    void validate() const;
};

// Figure for planned setpoints: the z(V) trace (when several biases) or the gap against setpoint
// current (a ladder), then I(s) and phi_ap(s) around a reachable setpoint's gap (options.side_bias_V),
// and I(V) at that gap. points: plan_setpoints' result, at least one reachable.
// Throws tipgap::error (no_answer) when no point is reachable.
plot::figure plan_figure(const config& c, const std::vector<plan_point>& points, int threads = 0,
                         const figure_options& options = {});

// Figure for predictions on gaps x biases (as `predict` lays them out: bias outer, gap inner).
// gaps: distinct gaps (m), ascending as given; biases: distinct biases (V); results: gaps.size() *
// biases.size() predictions, results[ib * gaps.size() + ig]. With one gap and one bias the figure
// shows I(s), phi_ap(s) and I(V) around the point.
// Log current axes start at options.current_floor_A when the data go below it.
plot::figure predict_figure(const config& c, const std::vector<double>& gaps, const std::vector<double>& biases,
                            const std::vector<prediction>& results, int threads = 0, const figure_options& options = {});

}  // namespace tipgap
