#pragma once
// The figures of `plan` and `predict`: the curves are computed here from the model (physics), then
// handed to tipgap::plot (drawing only). Current against gap on a log axis, current against bias,
// the constant-current trace z(V), apparent barrier height against gap, and for a (gap, bias) grid a
// colour map of log10 |I|.
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plot/plot.hpp"
#include "tipgap/plan/predict.hpp"

namespace tipgap {

// Figure for planned setpoints: the z(V) trace (when several biases) or the gap against setpoint
// current (a ladder), then I(s) and phi_ap(s) around the first reachable setpoint's gap, and I(V)
// at that gap. points: plan_setpoints' result, at least one reachable.
// Throws tipgap::error (no_answer) when no point is reachable.
plot::figure plan_figure(const config& c, const std::vector<plan_point>& points, int threads = 0);

// Figure for predictions on gaps x biases (as `predict` lays them out: bias outer, gap inner).
// gaps: distinct gaps (m), ascending as given; biases: distinct biases (V); results: gaps.size() *
// biases.size() predictions, results[ib * gaps.size() + ig]. With one gap and one bias the figure
// shows I(s), phi_ap(s) and I(V) around the point.
plot::figure predict_figure(const config& c, const std::vector<double>& gaps, const std::vector<double>& biases,
                            const std::vector<prediction>& results, int threads = 0);

}  // namespace tipgap
