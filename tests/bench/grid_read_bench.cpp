// Speed of the streaming grid reader alone (read_grid with a visitor that only touches the
// samples; no fit) on a 64 x 64 x 128 synthetic grid written to a temporary file, in each layout:
// comma, tab, whitespace, and semicolons with decimal commas. The layouts run in one process, so
// their ratios hold whatever the machine's load. Currents I = 1 nA exp(-2 κ z), κ = 10 /nm.
#include <benchmark/benchmark.h>

#include <atomic>
#include <cmath>
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <string>
#include <unistd.h>
#include <vector>

#include "tipgap/grid/grid.hpp"

namespace {

enum layout { comma, tab, whitespace, semicolon_decimal_comma };

// The grid files of this run, removed at exit.
struct written_files {
    std::vector<std::string> paths;
    ~written_files() {
        for (const std::string& p : paths) std::filesystem::remove(p);
    }
} written;

std::string grid_file(layout l) {
    const std::string path = (std::filesystem::temp_directory_path() / fmt::format("tipgap_grid_read_bench_{}_{}.csv", ::getpid(), static_cast<int>(l))).string();
    if (std::filesystem::exists(path)) return path;
    written.paths.push_back(path);
    const char* sep = l == comma ? "," : l == tab ? "\t" : l == whitespace ? " " : ";";
    std::ofstream out(path);
    out << "# bias: 0.1 V\n" << fmt::format("x [nm]{0}y [nm]{0}z [nm]{0}current [pA]\n", sep);
    std::string row;
    for (int iy = 0; iy < 64; ++iy) {
        for (int ix = 0; ix < 64; ++ix) {
            for (int k = 0; k < 128; ++k) {
                const double z = 0.4 * k / 127;
                row = fmt::format("{1}{0}{2}{0}{3:.4f}{0}{4:.6g}\n", sep, ix, iy, z, 1000.0 * std::exp(-20.0 * z));
                if (l == semicolon_decimal_comma)
                    for (char& c : row)
                        if (c == '.') c = ',';
                out << row;
            }
        }
    }
    return path;
}

void read_grid_layout(benchmark::State& state) {
    const std::string path = grid_file(static_cast<layout>(state.range(0)));
    tipgap::grid_read_options o;
    o.threads = 1;
    std::uint64_t bytes = 0;
    for (auto _ : state) {
        std::atomic<double> sum{0.0};
        const tipgap::grid_layout l = tipgap::read_grid(path, o, [&](const tipgap::grid_pixel_view& p, unsigned) {
            sum = sum + p.current_A.back();
        });
        bytes += l.bytes;
        benchmark::DoNotOptimize(sum.load());
    }
    state.SetBytesProcessed(static_cast<int64_t>(bytes));
}
BENCHMARK(read_grid_layout)->ArgName("layout")->Arg(comma)->Arg(tab)->Arg(whitespace)->Arg(semicolon_decimal_comma)->UseRealTime();

}  // namespace

BENCHMARK_MAIN();
