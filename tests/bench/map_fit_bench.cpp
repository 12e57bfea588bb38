// Per-pixel cost of the map fit: fit_sweep (SVD line, profile, warnings) against fit_sweep_fast
// (same statistics, closed-form line, no profile) on one noisy synthetic 128-point pixel, and the
// grid reader on an in-memory-cached synthetic grid file. Built, not run by ctest.
#include <benchmark/benchmark.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <random>
#include <unistd.h>

#include "fit/detail/fit_fast.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/grid/grid.hpp"

namespace {

// Synthetic pixel: 1 nA exp(-2 κ z) for φ = 4 eV (κ = 10.25/nm) plus 0.5 pA Gaussian noise.
tipgap::curve_sweep pixel(int n) {
    std::mt19937_64 rng(1);
    std::normal_distribution<double> noise(0.0, 0.5e-12);
    tipgap::curve_sweep s;
    for (int k = 0; k < n; ++k) {
        const double z = 0.4e-9 * k / (n - 1);
        s.z_m.push_back(z);
        s.current_A.push_back(1e-9 * std::exp(-2.0 * 10.25e9 * z) + noise(rng));
    }
    return s;
}

void fit_sweep_full(benchmark::State& state) {
    const tipgap::curve_sweep s = pixel(static_cast<int>(state.range(0)));
    const tipgap::fit_options o;
    for (auto _ : state) benchmark::DoNotOptimize(tipgap::fit_sweep(s, 0.1, o));
    state.SetItemsProcessed(state.iterations() * state.range(0));
}
BENCHMARK(fit_sweep_full)->Arg(64)->Arg(128)->Arg(256);

void fit_sweep_lean(benchmark::State& state) {
    const tipgap::curve_sweep s = pixel(static_cast<int>(state.range(0)));
    const tipgap::fit_options o;
    tipgap::fit_workspace ws;
    tipgap::fit_result r;
    for (auto _ : state) benchmark::DoNotOptimize(tipgap::fit_sweep_fast(s.z_m, s.current_A, 0.1, o, ws, r));
    state.SetItemsProcessed(state.iterations() * state.range(0));
}
BENCHMARK(fit_sweep_lean)->Arg(64)->Arg(128)->Arg(256);

// read_grid without fits on a 64 x 64 x 128 grid (~12 MB, page cache), by thread count.
void read_grid_parse(benchmark::State& state) {
    const std::string path = fmt::format("{}/tipgap_map_fit_bench_{}.csv", std::filesystem::temp_directory_path().string(), ::getpid());
    {
        std::ofstream f(path);
        f << "x [nm],y [nm],z [nm],current [pA]\n";
        std::mt19937_64 rng(2);
        std::normal_distribution<double> noise(0.0, 0.5);
        for (int iy = 0; iy < 64; ++iy)
            for (int ix = 0; ix < 64; ++ix)
                for (int k = 0; k < 128; ++k) {
                    const double z = 0.4 * k / 127;
                    f << fmt::format("{},{},{:.5f},{:.5g}\n", ix, iy, z, 1000 * std::exp(-20.5 * z) + noise(rng));
                }
    }
    tipgap::grid_read_options o;
    o.threads = static_cast<int>(state.range(0));
    const auto bytes = static_cast<int64_t>(std::filesystem::file_size(path));
    for (auto _ : state) benchmark::DoNotOptimize(tipgap::read_grid(path, o, [](const tipgap::grid_pixel_view&, unsigned) {}));
    state.SetBytesProcessed(state.iterations() * bytes);
    std::remove(path.c_str());
}
BENCHMARK(read_grid_parse)->Arg(1)->Arg(2)->UseRealTime();

}  // namespace

BENCHMARK_MAIN();
