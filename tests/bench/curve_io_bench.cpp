// Speed of the curve reader (parse only, file already in memory) and of one default fit, so that
// the grid reader that reuses the row scanner has a measured baseline.
#include <benchmark/benchmark.h>

#include <cmath>
#include <fmt/format.h>
#include <string>

#include "tipgap/io/curve_io.hpp"
#include "tipgap/fit/fit.hpp"

namespace {

std::string make_text(int rows) {
    std::string text = "# bias: 100 mV\n# setpoint_current: 1 nA\nz [nm],current [nA]\n";
    for (int k = 0; k < rows; ++k) {
        const double z = 0.5 * k / rows;
        text += fmt::format("{:.17g},{:.17g}\n", z, std::exp(-20.0 * z) + 1e-3 * std::sin(7.0 * k));
    }
    return text;
}

void parse_curve(benchmark::State& state) {
    const std::string text = make_text(static_cast<int>(state.range(0)));
    for (auto _ : state) benchmark::DoNotOptimize(tipgap::parse_curve_csv(text, "bench.csv"));
    state.SetBytesProcessed(static_cast<int64_t>(state.iterations()) * static_cast<int64_t>(text.size()));
    state.SetItemsProcessed(state.iterations() * state.range(0));
}
BENCHMARK(parse_curve)->Arg(1000)->Arg(100000);

void fit_default(benchmark::State& state) {
    const auto curve = tipgap::parse_curve_csv(make_text(static_cast<int>(state.range(0))), "bench.csv");
    tipgap::fit_options o;
    for (auto _ : state) benchmark::DoNotOptimize(tipgap::fit_curve(curve, o));
}
BENCHMARK(fit_default)->Arg(200)->Arg(2000);

}  // namespace

BENCHMARK_MAIN();
