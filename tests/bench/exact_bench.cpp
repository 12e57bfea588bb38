// `method: exact` speed (issue 12 targets: one J at 4.2 K <= 2 ms; a 150-point constant-current
// z(V) trace <= 5 s on one core; `resonances` on such a trace <= 30 s). Built-in junction (W tip 4.5 eV, Au sample 5.3 eV, exact image,
// 4.2 K, planar 1 nm^2) at the default tolerance 1e-6.
#include <benchmark/benchmark.h>

#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/fit/resonances.hpp"
#include "tipgap/model/current.hpp"
#include "tipgap/plan/plan.hpp"

namespace {

tipgap::model_options exact_junction() {
    tipgap::model_options o = tipgap::default_config().model;
    o.method = tipgap::method_kind::exact;
    o.bias_limit_V = 12.0;
    return o;
}

// One J, walking the gap over 0.5..1.5 nm so that no two calls repeat. Bias from the argument (mV).
void exact_J_4K(benchmark::State& state) {
    const auto o = exact_junction();
    const double bias = static_cast<double>(state.range(0)) * 1e-3;
    double s = 0.5e-9, acc = 0.0;
    for (auto _ : state) {
        s = s < 1.5e-9 ? s + 1.3e-12 : 0.5e-9;
        acc += tipgap::current_density(o, s, bias);
    }
    benchmark::DoNotOptimize(acc);
    state.counters["J_per_s"] = benchmark::Counter(static_cast<double>(state.iterations()), benchmark::Counter::kIsRate);
}

// 150 setpoints at 1 nA from 4 to 11.5 V on one thread: the gap solve and the slope at each point,
// through the resonance regime.
void exact_zv_trace_150(benchmark::State& state) {
    tipgap::config c = tipgap::default_config();
    c.model = exact_junction();
    std::vector<std::pair<double, double>> setpoints;
    for (int i = 0; i < 150; ++i) setpoints.emplace_back(1e-9, 4.0 + 7.5 * i / 149.0);
    int evaluations = 0;
    for (auto _ : state) {
        const auto plan = tipgap::plan_setpoints(c, setpoints, {}, 1);
        for (const auto& p : plan) evaluations += p.evaluations;
        benchmark::DoNotOptimize(plan.data());
    }
    state.counters["J_per_trace"] = static_cast<double>(evaluations) / static_cast<double>(state.iterations());
}

// `resonances` on such a trace (sample 4.8 eV, 4..11.5 V, 150 points, noise-free), one thread:
// peaks, the formula and the model fit (its model traces are the cost).
void resonances_150(benchmark::State& state) {
    tipgap::config truth = tipgap::default_config();
    truth.model = exact_junction();
    truth.model.sample.work_function_J = 4.8 * 1.602176634e-19;
    tipgap::bias_trace t;
    t.kind = tipgap::trace_kind::zv;
    t.current_A = 1e-9;
    std::vector<std::pair<double, double>> setpoints;
    for (int i = 0; i < 150; ++i) setpoints.emplace_back(1e-9, 4.0 + 7.5 * i / 149.0);
    for (const auto& p : tipgap::plan_setpoints(truth, setpoints, {}, 1)) {
        t.bias_V.push_back(p.bias_V);
        t.signal.push_back(p.solution.gap_m);
    }
    tipgap::resonance_options o;
    o.threads = 1;
    int traces = 0;
    for (auto _ : state) {
        const auto r = tipgap::analyse_resonances(tipgap::default_config(), t, o);
        traces += r.model_traces;
        benchmark::DoNotOptimize(r.work_function_J);
    }
    state.counters["model_traces"] = static_cast<double>(traces) / static_cast<double>(state.iterations());
}

}  // namespace

BENCHMARK(exact_J_4K)->Arg(100)->Arg(1000)->Arg(3000)->Arg(8000)->Unit(benchmark::kMicrosecond);
BENCHMARK(exact_zv_trace_150)->Unit(benchmark::kSecond)->Iterations(2);
BENCHMARK(resonances_150)->Unit(benchmark::kSecond)->Iterations(1);
BENCHMARK_MAIN();
