// Speed of the grid synthesiser: a 256x256x128 grid (8.4 million rows, about 200 MB) streamed to a
// temporary file, the size `tipgap map` is meant for; and one 121-point curve (model-bound).
#include <benchmark/benchmark.h>

#include <cstdio>
#include <filesystem>
#include <string>
#include <unistd.h>

#include "tipgap/synth/synth.hpp"

namespace {

void synth_grid(benchmark::State& state) {
    const tipgap::config c = tipgap::default_config();
    tipgap::synth_options o;
    o.points = static_cast<std::size_t>(state.range(1));
    o.current_noise_A = 1e-12;
    tipgap::synth_grid_options g;
    g.nx = g.ny = static_cast<std::size_t>(state.range(0));
    const auto dir = std::filesystem::temp_directory_path();
    const std::string csv = (dir / ("tipgap-bench-grid-" + std::to_string(::getpid()) + ".csv")).string();
    const std::string yaml = tipgap::truth_path_for(csv);
    for (auto _ : state) benchmark::DoNotOptimize(tipgap::write_synth_grid(c, o, g, csv, yaml));
    state.SetBytesProcessed(static_cast<int64_t>(state.iterations()) *
                            static_cast<int64_t>(std::filesystem::file_size(csv)));
    state.SetItemsProcessed(state.iterations() * state.range(0) * state.range(0) * state.range(1));
    std::remove(csv.c_str());
    std::remove(yaml.c_str());
}
BENCHMARK(synth_grid)->Args({64, 128})->Args({256, 128})->Unit(benchmark::kMillisecond)->Iterations(1);

void synth_curve(benchmark::State& state) {
    const tipgap::config c = tipgap::default_config();
    tipgap::synth_options o;
    o.current_noise_A = 1e-12;
    for (auto _ : state) benchmark::DoNotOptimize(tipgap::synthesise_curve(c, o));
}
BENCHMARK(synth_curve)->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
