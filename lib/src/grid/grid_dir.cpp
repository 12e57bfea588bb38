// A grid given as a directory of single-curve files, one pixel per file, positioned by the
// `x` and `y` metadata. Files are taken in name order; workers read and visit them, and the first
// failing file in that order is the one reported, whatever the thread count.
#include <algorithm>
#include <atomic>
#include <chrono>
#include <condition_variable>
#include <exception>
#include <filesystem>
#include <fmt/format.h>
#include <limits>
#include <mutex>
#include <thread>

#include "io/detail/csv_header.hpp"
#include "grid/detail/grid_internal.hpp"

namespace tipgap::detail {

grid_layout read_grid_directory(const std::string& path, const grid_read_options& options, const grid_visitor& visit) {
    namespace fs = std::filesystem;
    grid_layout layout;
    layout.path = path;
    layout.directory = true;
    std::vector<std::string> files;
    std::vector<std::uint64_t> sizes;
    std::error_code ec;
    for (const fs::directory_entry& e : fs::directory_iterator(path, ec)) {
        if (!e.is_regular_file()) continue;
        const std::string ext = e.path().extension().string();
        if (!iequals(ext, ".csv")) continue;
        files.push_back(e.path().string());
    }
    if (ec) throw_input(location{path, 0, 0, ""}, fmt::format("cannot list the directory: {}", ec.message()));
    if (files.empty()) {
        throw_input(location{path, 0, 0, ""}, "the directory holds no .csv curve files; expected one file per pixel "
                                              "with '# x: <length>' and '# y: <length>' metadata");
    }
    std::sort(files.begin(), files.end());
    std::uint64_t total = 0;
    for (const std::string& f : files) {
        sizes.push_back(fs::file_size(f, ec));
        total += ec ? 0 : sizes.back();
    }

    const unsigned workers = std::min<unsigned>(resolved_threads(options), static_cast<unsigned>(files.size()));
    std::vector<pixel_run> runs(files.size());
    std::vector<std::exception_ptr> failures(files.size());
    std::atomic<std::size_t> next{0}, first_failure{files.size()};
    std::atomic<std::uint64_t> done_bytes{0};
    std::atomic<unsigned> running{workers};
    std::mutex m;
    std::condition_variable finished;

    auto work = [&](unsigned slot) {
        for (;;) {
            const std::size_t i = next.fetch_add(1);
            // Files after a failure need not be read: only an earlier failure could replace it.
            if (i >= files.size() || i > first_failure.load()) break;
            try {
                const measured_curve c = read_curve_csv(files[i]);
                if (!c.metadata.x_m || !c.metadata.y_m) {
                    throw_input(location{files[i], 0, 0, c.metadata.x_m ? "y" : "x"},
                                "no lateral position in the metadata; every file of a grid directory needs "
                                "'# x: <length>' and '# y: <length>' lines, e.g. '# x: 1.5 nm'");
                }
                if (i == 0) layout.metadata = c.metadata;
                const curve_sweep& s = c.sweeps.front();
                grid_pixel_view v;
                v.x_m = *c.metadata.x_m;
                v.y_m = *c.metadata.y_m;
                v.z_m = s.z_m;
                v.current_A = s.current_A;
                v.bias_V = c.metadata.bias_V ? *c.metadata.bias_V : std::numeric_limits<double>::quiet_NaN();
                v.where = location{files[i], 0, 0, ""};
                visit(v, slot);
                runs[i] = pixel_run{v.x_m, v.y_m, 0, s.z_m.size(), static_cast<std::uint32_t>(i)};
            } catch (...) {
                failures[i] = std::current_exception();
                std::size_t f = first_failure.load();
                while (i < f && !first_failure.compare_exchange_weak(f, i)) {
                }
            }
            done_bytes += sizes[i];
        }
        {
            std::lock_guard lock(m);
            --running;
        }
        finished.notify_all();
    };
    std::vector<std::thread> pool;
    for (unsigned w = 0; w < workers; ++w) pool.emplace_back(work, w);
    {
        // Report progress from the calling thread while the workers run.
        std::unique_lock lock(m);
        while (!finished.wait_for(lock, std::chrono::milliseconds(100), [&] { return running.load() == 0; })) {
            if (options.progress) {
                lock.unlock();
                options.progress(std::min(done_bytes.load(), total), total);
                lock.lock();
            }
        }
    }
    for (auto& t : pool) t.join();
    if (first_failure.load() < files.size()) std::rethrow_exception(failures[first_failure.load()]);
    if (options.progress) options.progress(total, total);
    for (const pixel_run& r : runs) layout.samples += r.samples;
    layout.bytes = total;
    check_grid(runs, files, false, layout);
    return layout;
}

}  // namespace tipgap::detail
