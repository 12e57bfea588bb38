// Forward-model speed: evaluations per second of one current density J (issue target: >= 20,000
// wkb evaluations per second per core at 1e-6 relative accuracy, exact image, 4.2 K).
#include <benchmark/benchmark.h>

#include "tipgap/config/config.hpp"
#include "tipgap/model/current.hpp"

namespace {

tipgap::model_options junction(tipgap::method_kind m) {
    tipgap::model_options o = tipgap::default_config().model;  // W tip 4.5 eV, Au 5.3 eV, exact image, 4.2 K
    o.method = m;
    o.rel_tol = 1e-6;
    return o;
}

void run(benchmark::State& state, tipgap::method_kind m, double bias) {
    auto o = junction(m);
    double s = 0.5e-9;
    double acc = 0;
    for (auto _ : state) {
        // Walk the gap so that no two calls are the same point.
        s = s < 1.5e-9 ? s + 1.3e-12 : 0.5e-9;
        acc += tipgap::current_density(o, s, bias);
    }
    benchmark::DoNotOptimize(acc);
    state.counters["J_per_s"] = benchmark::Counter(static_cast<double>(state.iterations()), benchmark::Counter::kIsRate);
}

void wkb_exact_4K_100mV(benchmark::State& st) { run(st, tipgap::method_kind::wkb, 0.1); }
void wkb_exact_4K_2V(benchmark::State& st) { run(st, tipgap::method_kind::wkb, 2.0); }
void simmons_exact_4K_100mV(benchmark::State& st) { run(st, tipgap::method_kind::simmons, 0.1); }

// J with dJ/ds and dJ/dV from one pass (what evaluate_point runs): its time over wkb_exact_4K_100mV's
// is the cost of a predicted point in plain J evaluations.
void j_with_slopes_wkb_100mV(benchmark::State& state) {
    auto o = junction(tipgap::method_kind::wkb);
    double s = 0.5e-9, acc = 0;
    for (auto _ : state) {
        s = s < 1.5e-9 ? s + 1.3e-12 : 0.5e-9;
        acc += tipgap::current_density_derivatives(o, s, 0.1).d_dV_S_per_m2;
    }
    benchmark::DoNotOptimize(acc);
    state.counters["passes_per_s"] = benchmark::Counter(static_cast<double>(state.iterations()), benchmark::Counter::kIsRate);
}

void evaluate_point_wkb(benchmark::State& state) {
    auto o = junction(tipgap::method_kind::wkb);
    double s = 0.5e-9;
    for (auto _ : state) {
        s = s < 1.5e-9 ? s + 1.3e-12 : 0.5e-9;
        benchmark::DoNotOptimize(tipgap::evaluate_point(o, s, 0.1));
    }
    state.counters["points_per_s"] = benchmark::Counter(static_cast<double>(state.iterations()), benchmark::Counter::kIsRate);
}

}  // namespace

BENCHMARK(wkb_exact_4K_100mV);
BENCHMARK(wkb_exact_4K_2V);
BENCHMARK(simmons_exact_4K_100mV);
BENCHMARK(j_with_slopes_wkb_100mV);
BENCHMARK(evaluate_point_wkb);
BENCHMARK_MAIN();
