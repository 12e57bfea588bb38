// One planned setpoint with its instrument-facing quantities, and many setpoints in parallel.
#include <cmath>
#include <fmt/format.h>

#include "core/detail/parallel.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/model/geometry.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/predict.hpp"
#include "tipgap/plan/warnings.hpp"

namespace tipgap {

plan_point plan_setpoint(const config& c, double current_A, double bias_V, const plan_options& o) {
    plan_point p;
    p.setpoint_A = current_A;
    p.bias_V = bias_V;
    p.solution = solve_gap(c, current_A, bias_V, o);
    p.evaluations = p.solution.evaluations;
    if (!p.reachable()) {
        p.warnings.push_back(p.solution.message);
        return p;
    }
    const double s = p.solution.gap_m, I = p.solution.current_A;
    p.gap_resistance_ohm = bias_V / I;
    p.conductance_G0 = I / bias_V / si::conductance_quantum;
    // d ln|I|/ds of the total current by central differences: ln|I| is nearly linear in s, so the
    // O(h^2) error at h = 0.01 nm is ~1e-5 relative, while the model noise (rel_tol) divided by 2h
    // stays far below the slope (~2e10 /m).
    const double h = std::min(o.slope_step_m, 0.25 * s);
    const double ip = total_current(c.model, c.geometry, s + h, bias_V);
    const double im = total_current(c.model, c.geometry, s - h, bias_V);
    p.evaluations += 2;
    if (ip != 0.0 && im != 0.0) {
        const double slope = (std::log(std::abs(ip)) - std::log(std::abs(im))) / (2.0 * h);  // 1/m, < 0
        p.decay_constant_per_m = -0.5 * slope;
        p.nm_per_decade = slope < 0 ? std::log(10.0) / -slope * 1e9 : std::numeric_limits<double>::infinity();
        // Apparent barrier height, phi_ap = (hbar^2 / 8m) (d ln I / ds)^2 (Binnig & Rohrer 1982,
        // Helv. Phys. Acta 55, 726; the usual 0.952 eV Å^2 form).
        p.apparent_barrier_J = si::hbar * si::hbar / (8.0 * si::electron_mass) * slope * slope;
    }
    p.kind = classify(c.model, s, bias_V);
    if (p.solution.status == solve_status::not_converged) p.warnings.push_back(p.solution.message);
    for (auto& w : operating_warnings(s, bias_V, p.conductance_G0, p.kind)) p.warnings.push_back(std::move(w));
    return p;
}

std::vector<plan_point> plan_setpoints(const config& c, const std::vector<std::pair<double, double>>& setpoints,
                                       const plan_options& o, int threads) {
    o.validate();
    std::vector<plan_point> out(setpoints.size());
    detail::parallel_for(setpoints.size(), threads,
                 [&](std::size_t i) { out[i] = plan_setpoint(c, setpoints[i].first, setpoints[i].second, o); });
    std::size_t reachable = 0;
    for (const auto& p : out) reachable += p.reachable();
    if (!out.empty() && reachable == 0) {
        const auto& first = out.front();
        std::string what = out.size() == 1
                               ? fmt::format("{:g} A at {:g} V: {}", first.setpoint_A, first.bias_V, first.solution.message)
                               : fmt::format("none of the {} setpoints can be reached (first: {:g} A at {:g} V: {})",
                                             out.size(), first.setpoint_A, first.bias_V, first.solution.message);
        throw error(error_kind::no_answer, what);
    }
    return out;
}

}  // namespace tipgap
