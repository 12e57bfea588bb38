// Speed of the curve reader (parse only, file already in memory) in each layout, and of one
// default fit, so that the grid reader that reuses the row scanner has a measured baseline. The
// layouts run in one process, so their ratios hold whatever the machine's load.
#include <benchmark/benchmark.h>

#include <cmath>
#include <fmt/format.h>
#include <string>

#include "tipgap/io/curve_io.hpp"
#include "tipgap/fit/fit.hpp"

namespace {

// The layouts of parse_curve's second argument.
enum layout { comma, tab, whitespace, semicolon_decimal_comma };

std::string make_text(int rows, layout l = comma) {
    const char* header[] = {"z [nm],current [nA]", "Z (nm)\tI (nA)", "z/nm  current/nA", "z [nm];current [nA]"};
    std::string text = fmt::format("# bias: 100 mV\n# setpoint_current: 1 nA\n{}\n", header[l]);
    for (int k = 0; k < rows; ++k) {
        const double z = 0.5 * k / rows;
        std::string row = fmt::format("{:.17g}{}{:.17g}\n", z, l == comma ? "," : l == tab ? "\t" : l == whitespace ? "  " : ";",
                                      std::exp(-20.0 * z) + 1e-3 * std::sin(7.0 * k));
        if (l == semicolon_decimal_comma)
            for (char& c : row)
                if (c == '.') c = ',';
        text += row;
    }
    return text;
}

void parse_curve(benchmark::State& state) {
    const std::string text = make_text(static_cast<int>(state.range(0)), static_cast<layout>(state.range(1)));
    for (auto _ : state) benchmark::DoNotOptimize(tipgap::parse_curve_csv(text, "bench.csv"));
    state.SetBytesProcessed(static_cast<int64_t>(state.iterations()) * static_cast<int64_t>(text.size()));
    state.SetItemsProcessed(state.iterations() * state.range(0));
}
BENCHMARK(parse_curve)
    ->ArgNames({"rows", "layout"})
    ->Args({1000, comma})
    ->Args({100000, comma})
    ->Args({100000, tab})
    ->Args({100000, whitespace})
    ->Args({100000, semicolon_decimal_comma});

void fit_default(benchmark::State& state) {
    const auto curve = tipgap::parse_curve_csv(make_text(static_cast<int>(state.range(0))), "bench.csv");
    tipgap::fit_options o;
    for (auto _ : state) benchmark::DoNotOptimize(tipgap::fit_curve(curve, o));
}
BENCHMARK(fit_default)->Arg(200)->Arg(2000);

// The linear model (map's default), for the ratio to the default offset model in one run.
void fit_linear(benchmark::State& state) {
    const auto curve = tipgap::parse_curve_csv(make_text(static_cast<int>(state.range(0))), "bench.csv");
    tipgap::fit_options o;
    o.model = tipgap::fit_model::linear;
    for (auto _ : state) benchmark::DoNotOptimize(tipgap::fit_curve(curve, o));
}
BENCHMARK(fit_linear)->Arg(200)->Arg(2000);

}  // namespace

BENCHMARK_MAIN();
