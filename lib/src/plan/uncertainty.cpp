// Monte Carlo and linear propagation of the configured input uncertainties.
#include "tipgap/plan/uncertainty.hpp"

#include <algorithm>
#include <boost/random/normal_distribution.hpp>
#include <cmath>
#include <random>

#include "core/detail/parallel.hpp"
#include "core/detail/quantile.hpp"
#include "plan/detail/gap_solver.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/plan/predict.hpp"

namespace tipgap {
namespace {

// One uncertain input: where it lives in the config, its standard uncertainty and physical range.
struct input {
    const char* name;
    double* (*at)(config&);
    double sigma, lo, hi;
};

std::vector<input> uncertain_inputs(const config& c) {
    std::vector<input> v;
    if (c.sigma.tip_work_function_J > 0)
        v.push_back({"tip.work_function", [](config& x) { return &x.model.tip.work_function_J; },
                     c.sigma.tip_work_function_J, uncertain_work_function_min_J, uncertain_work_function_max_J});
    if (c.sigma.sample_work_function_J > 0)
        v.push_back({"sample.work_function", [](config& x) { return &x.model.sample.work_function_J; },
                     c.sigma.sample_work_function_J, uncertain_work_function_min_J, uncertain_work_function_max_J});
    if (c.sigma.apex_radius_m > 0 && c.geometry.kind == geometry_kind::paraboloid)
        v.push_back({"geometry.apex_radius", [](config& x) { return &x.geometry.apex_radius_m; },
                     c.sigma.apex_radius_m, uncertain_apex_radius_min_m, uncertain_apex_radius_max_m});
    return v;
}

}  // namespace

void uncertainty_options::validate() const {
    if (samples < 0 || samples > 1000000) {
        location w;
        w.key = "samples";
        throw_input(w, "the Monte Carlo sample count must be in 0..1000000");
    }
}

namespace {

// Standard normal 97.5 % quantile (two-sided 95 % coverage of a normal output).
constexpr double normal_quantile_975 = 1.959963984540054;

// Linear propagation (GUM eq. 10). Central differences with a step of one standard uncertainty
// (shrunk to stay inside the physical range): for small u this is the derivative, for large u a
// secant over ±u, which is what linear propagation of a ±u input means.
void propagate_linearly(const config& c, const std::vector<input>& inputs, const output_function& f,
                        uncertainty_summary& out) {
    const std::size_t m = out.values.size();
    std::vector<double> var(m, 0.0);
    for (const auto& in : inputs) {
        config plus = c, minus = c;
        double& xp = *in.at(plus);
        double& xm = *in.at(minus);
        const double x0 = xp;
        const double h = std::min({in.sigma, 0.5 * (x0 - in.lo), 0.5 * (in.hi - x0)});
        xp = x0 + h;
        xm = x0 - h;
        const auto fp = f(plus), fm = f(minus);
        for (std::size_t k = 0; k < m; ++k) {
            const double d = (fp[k] - fm[k]) / (2.0 * h);
            var[k] += d * in.sigma * d * in.sigma;
        }
    }
    for (std::size_t k = 0; k < m; ++k) {
        auto& v = out.values[k];
        v.linear_stddev = std::sqrt(var[k]);
        v.linear_ci95_low = v.value - normal_quantile_975 * v.linear_stddev;
        v.linear_ci95_high = v.value + normal_quantile_975 * v.linear_stddev;
    }
}

// The Monte Carlo draws of the configuration, each input from its normal distribution truncated to
// the physical range (draws outside are drawn again and counted in out.redrawn). All draws come
// from one sequential stream before any evaluation, so the result does not depend on the thread
// count. Boost.Random's normal distribution (ziggurat) gives the same numbers on every platform,
// unlike std::normal_distribution.
std::vector<config> draw_configs(const config& c, const std::vector<input>& inputs, const uncertainty_options& o,
                                 uncertainty_summary& out) {
    std::mt19937_64 rng(o.seed);
    boost::random::normal_distribution<double> unit(0.0, 1.0);
    std::vector<config> draws(static_cast<std::size_t>(o.samples), c);
    for (auto& d : draws)
        for (const auto& in : inputs) {
            double& x = *in.at(d);
            const double x0 = x;
            for (int tries = 0;; ++tries) {
                x = x0 + in.sigma * unit(rng);
                if (x >= in.lo && x <= in.hi) break;
                ++out.redrawn;
                if (tries > 1000) {
                    location w;
                    w.key = in.name;
                    throw_input(w, "the uncertainty is so large that draws keep leaving the physical range");
                }
            }
        }
    return draws;
}

// Mean, standard deviation (n - 1) and 95 % coverage interval (JCGM 101 §7.7) of each output over
// the draws with a finite value; counts the draws where any output had none in out.failed.
void summarise_draws(const std::vector<std::vector<double>>& results, uncertainty_summary& out) {
    const std::size_t m = out.values.size();
    for (const auto& r : results) {
        bool ok = r.size() >= m;
        for (std::size_t k = 0; ok && k < m; ++k) ok = std::isfinite(r[k]);
        out.failed += !ok;
    }
    for (std::size_t k = 0; k < m; ++k) {
        std::vector<double> x;
        for (const auto& r : results)
            if (k < r.size() && std::isfinite(r[k])) x.push_back(r[k]);
        auto& v = out.values[k];
        v.valid_samples = static_cast<int>(x.size());
        if (x.empty()) continue;
        double mean = 0.0;
        for (double xi : x) mean += xi;
        mean /= static_cast<double>(x.size());
        double ss = 0.0;
        for (double xi : x) ss += (xi - mean) * (xi - mean);
        v.mc_mean = mean;
        v.mc_stddev = x.size() > 1 ? std::sqrt(ss / static_cast<double>(x.size() - 1)) : NAN;
        std::sort(x.begin(), x.end());
        v.ci95_low = detail::quantile_sorted(x, 0.025);
        v.ci95_high = detail::quantile_sorted(x, 0.975);
    }
}

}  // namespace

uncertainty_summary propagate_uncertainty(const config& c, const std::vector<std::string>& names,
                                          const output_function& f, const uncertainty_options& o) {
    o.validate();
    uncertainty_summary out;
    out.names = names;
    out.seed = o.seed;
    const std::size_t m = names.size();
    out.values.resize(m);
    const std::vector<double> nominal = f(c);
    for (std::size_t k = 0; k < m; ++k) out.values[k].value = k < nominal.size() ? nominal[k] : NAN;
    const auto inputs = uncertain_inputs(c);
    for (const auto& in : inputs) out.inputs.push_back(in.name);
    if (inputs.empty()) return out;

    if (o.linear) propagate_linearly(c, inputs, f, out);
    if (o.samples > 0) {
        const std::vector<config> draws = draw_configs(c, inputs, o, out);
        std::vector<std::vector<double>> results(draws.size());
        detail::parallel_for(draws.size(), o.threads, [&](std::size_t i) { results[i] = f(draws[i]); });
        out.samples = o.samples;
        summarise_draws(results, out);
    }
    return out;
}

uncertainty_summary plan_uncertainty(const config& c, double current_A, double bias_V, const plan_options& plan,
                                     const uncertainty_options& o) {
    // Every draw starts its solve at the nominal gap, a few pm from its own: two or three Newton
    // steps instead of a cold start. The nominal evaluation itself then stops at its first step.
    const double nominal_gap = plan_setpoint(c, current_A, bias_V, plan).solution.gap_m;
    auto f = [&](const config& x) -> std::vector<double> {
        plan_point p = detail::plan_setpoint_from(x, current_A, bias_V, plan, nominal_gap);
        if (!p.reachable()) return {NAN, NAN, NAN};
        return {p.solution.gap_m * 1e9, p.nm_per_decade, p.apparent_barrier_J / si::electron_volt};
    };
    return propagate_uncertainty(c, {"gap_nm", "nm_per_decade", "apparent_barrier_eV"}, f, o);
}

uncertainty_summary predict_uncertainty(const config& c, double gap_m, double bias_V, const uncertainty_options& o) {
    auto f = [&](const config& x) -> std::vector<double> {
        prediction p = predict_points(x, {{gap_m, bias_V}}, 1).front();
        const double kappa_nm = p.q.decay_constant_per_m * 1e-9;
        return {p.current_A, p.conductance_G0, kappa_nm > 0 ? std::log(10.0) / (2.0 * kappa_nm) : NAN,
                p.q.apparent_barrier_J / si::electron_volt};
    };
    return propagate_uncertainty(c, {"current_A", "conductance_G0", "nm_per_decade", "apparent_barrier_eV"}, f, o);
}

std::vector<uncertainty_summary> predict_uncertainties(const config& c, const std::vector<std::pair<double, double>>& points,
                                                       const uncertainty_options& options) {
    std::vector<uncertainty_summary> u(points.size());
    if (c.sigma.any())
        for (std::size_t i = 0; i < points.size(); ++i) u[i] = predict_uncertainty(c, points[i].first, points[i].second, options);
    return u;
}

std::vector<uncertainty_summary> plan_uncertainties(const config& c, const std::vector<plan_point>& points,
                                                    const plan_options& plan, const uncertainty_options& options) {
    std::vector<uncertainty_summary> u(points.size());
    if (c.sigma.any())
        for (std::size_t i = 0; i < points.size(); ++i)
            if (points[i].reachable()) u[i] = plan_uncertainty(c, points[i].setpoint_A, points[i].bias_V, plan, options);
    return u;
}

}  // namespace tipgap
