// Cost of one gap solve per geometry: wall time, and model evaluations per solve as a counter.
#include <benchmark/benchmark.h>

#include "tipgap/config/config.hpp"
#include "tipgap/plan/plan.hpp"

static void solve(benchmark::State& state) {
    tipgap::config c = tipgap::default_config();
    c.geometry.kind = static_cast<tipgap::geometry_kind>(state.range(0));
    double evaluations = 0, solves = 0;
    for (auto _ : state) {
        auto g = tipgap::solve_gap(c, 1e-9, 0.1);
        benchmark::DoNotOptimize(g.gap_m);
        evaluations += g.evaluations;
        solves += 1;
    }
    state.counters["evaluations_per_solve"] = evaluations / solves;
    state.SetLabel(tipgap::to_string(c.geometry.kind));
}
BENCHMARK(solve)->Arg(0)->Arg(1)->Arg(2)->Unit(benchmark::kMillisecond);

BENCHMARK_MAIN();
