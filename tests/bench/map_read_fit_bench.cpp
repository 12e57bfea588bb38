// Read + fit alone, without the output files: make_barrier_map (parse, per-pixel fit, placement,
// statistics) and read_grid with an empty visitor (parse only) on the grid file named by the
// environment variable TIPGAP_BENCH_GRID (tests/bench/map_bench.py makes a 128 x 128 x 128 one
// with `tipgap synth --grid` and runs this), with 1 and 2 threads. Reports wall-clock bytes/s and
// the process CPU time (user + sys, all threads) per iteration as the counter cpu_s, since the
// machine may be shared. Built, not run by ctest.
#include <benchmark/benchmark.h>

#include <cstdlib>
#include <filesystem>
#include <string>
#include <sys/resource.h>

#include "tipgap/grid/grid.hpp"
#include "tipgap/grid/map.hpp"

namespace {

std::string grid_path() {
    const char* p = std::getenv("TIPGAP_BENCH_GRID");
    return p ? p : "";
}

double process_cpu_s() {
    rusage u{};
    ::getrusage(RUSAGE_SELF, &u);
    return static_cast<double>(u.ru_utime.tv_sec + u.ru_stime.tv_sec) +
           1e-6 * static_cast<double>(u.ru_utime.tv_usec + u.ru_stime.tv_usec);
}

template <class F>
void timed(benchmark::State& state, F&& once) {
    const std::string path = grid_path();
    if (path.empty() || !std::filesystem::exists(path)) {
        state.SkipWithError("set TIPGAP_BENCH_GRID to a grid CSV");
        return;
    }
    const auto bytes = static_cast<std::int64_t>(std::filesystem::file_size(path));
    const double cpu0 = process_cpu_s();
    for (auto _ : state) once(path);
    state.SetBytesProcessed(state.iterations() * bytes);
    state.counters["cpu_s"] = (process_cpu_s() - cpu0) / static_cast<double>(state.iterations());
}

void read_and_fit(benchmark::State& state) {
    tipgap::map_options o;
    o.read.threads = static_cast<int>(state.range(0));
    timed(state, [&](const std::string& path) { benchmark::DoNotOptimize(tipgap::make_barrier_map(path, o)); });
}
BENCHMARK(read_and_fit)->Arg(1)->Arg(2)->UseRealTime()->Unit(benchmark::kMillisecond);

void read_only(benchmark::State& state) {
    tipgap::grid_read_options o;
    o.threads = static_cast<int>(state.range(0));
    timed(state, [&](const std::string& path) {
        benchmark::DoNotOptimize(tipgap::read_grid(path, o, [](const tipgap::grid_pixel_view&, unsigned) {}));
    });
}
BENCHMARK(read_only)->Arg(1)->Arg(2)->UseRealTime()->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
