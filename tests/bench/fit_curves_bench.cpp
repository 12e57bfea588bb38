// fit_curve over many curves read from files (issue 14: fit on 200 curves of 200 points against
// scipy.optimize.curve_fit on the same arrays). tests/bench/fit_vs_curve_fit.py writes the curves
// and runs this program in the same run as curve_fit; alone:
//   fit_curves_bench --curves=<directory of *.csv> [Google Benchmark flags]
// The files are read once, before timing; each iteration fits every curve once, on one thread.
#include <benchmark/benchmark.h>

#include <algorithm>
#include <filesystem>
#include <string>
#include <string_view>
#include <vector>

#include "tipgap/fit/fit.hpp"
#include "tipgap/io/curve_io.hpp"

namespace {

std::vector<tipgap::measured_curve>& curves() {
    static std::vector<tipgap::measured_curve> all;
    return all;
}

void fit_all(benchmark::State& state, tipgap::fit_model model) {
    tipgap::fit_options o;
    o.model = model;
    for (auto _ : state)
        for (const auto& c : curves()) benchmark::DoNotOptimize(tipgap::fit_curve(c, o));
    state.SetItemsProcessed(state.iterations() * static_cast<int64_t>(curves().size()));
    state.counters["us_per_curve"] = benchmark::Counter(
        static_cast<double>(state.iterations() * static_cast<int64_t>(curves().size())) * 1e-6,
        benchmark::Counter::kIsRate | benchmark::Counter::kInvert);
}

}  // namespace

int main(int argc, char** argv) {
    std::vector<char*> rest;
    for (int i = 0; i < argc; ++i) {
        const std::string_view a = argv[i];
        if (!a.starts_with("--curves=")) {
            rest.push_back(argv[i]);
            continue;
        }
        std::vector<std::filesystem::path> files;
        for (const auto& e : std::filesystem::directory_iterator(std::string(a.substr(9))))
            if (e.path().extension() == ".csv") files.push_back(e.path());
        std::sort(files.begin(), files.end());
        for (const auto& f : files) curves().push_back(tipgap::read_curve_csv(f.string()));
    }
    if (curves().empty()) {
        fprintf(stderr, "usage: fit_curves_bench --curves=<directory of *.csv> [benchmark flags]\n");
        return 2;
    }
    benchmark::RegisterBenchmark("fit_curves/linear", fit_all, tipgap::fit_model::linear);
    benchmark::RegisterBenchmark("fit_curves/default_offset", fit_all, tipgap::fit_model::offset);
    int n = static_cast<int>(rest.size());
    benchmark::Initialize(&n, rest.data());
    benchmark::RunSpecifiedBenchmarks();
    benchmark::Shutdown();
    return 0;
}
