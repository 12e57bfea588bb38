// An in-memory grid visited like a grid file: checks first, then pixels on worker threads.
#include "tipgap/grid/grid_arrays.hpp"

#include <atomic>
#include <cmath>
#include <exception>
#include <fmt/format.h>
#include <mutex>
#include <thread>

namespace tipgap {

namespace {

[[noreturn]] void bad(const std::string& key, const std::string& what) { throw_input(location{"", 0, 0, key}, what); }

void check_positions(const std::vector<double>& v, const char* key) {
    if (v.empty()) bad(key, "no positions; expected at least one pixel");
    for (std::size_t i = 0; i < v.size(); ++i) {
        if (!std::isfinite(v[i])) bad(key, fmt::format("position {} is not finite; expected finite positions", i));
        if (i > 0 && !(v[i] > v[i - 1]))
            bad(key, fmt::format("positions {} and {} are not strictly ascending; expected distinct positions in "
                                 "ascending order",
                                 i - 1, i));
    }
}

void check_finite(std::span<const double> v, const char* key) {
    for (std::size_t i = 0; i < v.size(); ++i)
        if (!std::isfinite(v[i])) bad(key, fmt::format("value {} is not finite; expected finite values", i));
}

void check(const grid_arrays& g) {
    check_positions(g.x_m, "x");
    check_positions(g.y_m, "y");
    if (g.samples == 0) bad("z", "no samples per pixel; expected at least one");
    const std::size_t pixels = g.x_m.size() * g.y_m.size();
    if (g.current_A.size() != pixels * g.samples)
        bad("current", fmt::format("{} values for {} x {} pixels of {} samples; expected {}", g.current_A.size(),
                                   g.x_m.size(), g.y_m.size(), g.samples, pixels * g.samples));
    if (g.z_m.size() != g.samples && g.z_m.size() != pixels * g.samples)
        bad("z", fmt::format("{} values; expected {} (shared by every pixel) or {} (one run per pixel)", g.z_m.size(),
                             g.samples, pixels * g.samples));
    check_finite(g.z_m, "z");
    check_finite(g.current_A, "current");
}

}  // namespace

grid_layout visit_grid_arrays(const grid_arrays& g, const grid_read_options& options, const grid_visitor& visit) {
    check(g);
    grid_layout layout;
    layout.path = g.name;
    layout.arrays = true;
    layout.x_m = g.x_m;
    layout.y_m = g.y_m;
    layout.pixels = g.x_m.size() * g.y_m.size();
    layout.samples = layout.pixels * g.samples;
    if (std::isfinite(g.bias_V)) {
        layout.metadata.bias_V = g.bias_V;
        layout.metadata.entries.emplace_back("bias", fmt::format("{} V", g.bias_V));
    }
    const bool shared_z = g.z_m.size() == g.samples;
    std::atomic<std::size_t> next{0};
    std::exception_ptr failure;
    std::mutex m;
    auto work = [&](unsigned slot) {
        for (std::size_t k = next.fetch_add(1); k < layout.pixels; k = next.fetch_add(1)) {
            grid_pixel_view px;
            px.x_m = g.x_m[k % g.x_m.size()];
            px.y_m = g.y_m[k / g.x_m.size()];
            px.z_m = shared_z ? g.z_m : g.z_m.subspan(k * g.samples, g.samples);
            px.current_A = g.current_A.subspan(k * g.samples, g.samples);
            px.bias_V = g.bias_V;
            px.where = location{g.name, 0, 0, ""};
            try {
                visit(px, slot);
            } catch (...) {
                std::lock_guard<std::mutex> lock(m);
                if (!failure) failure = std::current_exception();
                next = layout.pixels;
                return;
            }
        }
    };
    const unsigned workers = static_cast<unsigned>(std::min<std::size_t>(resolved_threads(options), layout.pixels));
    std::vector<std::thread> pool;
    for (unsigned t = 1; t < workers; ++t) pool.emplace_back(work, t);
    work(0);
    for (auto& t : pool) t.join();
    if (failure) std::rethrow_exception(failure);
    return layout;
}

}  // namespace tipgap
