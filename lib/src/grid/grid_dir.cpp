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

namespace {

// The .csv files of the directory, in name order.
std::vector<std::string> list_curve_files(const std::string& path) {
    namespace fs = std::filesystem;
    std::vector<std::string> files;
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
    return files;
}

// The reader options of the grid for its curve files: z and current of the grid's four columns
// (x and y come from each file's metadata, with their units).
reader_options curve_options(const reader_options& grid) {
    reader_options o = grid;
    if (o.columns.size() == 4) o.columns = {grid.columns[2], grid.columns[3]};
    o.xy_unit.clear();
    return o;
}

// Reads the curve file `files[i]` and visits its first sweep as a pixel at the metadata's x, y.
// first_metadata: receives the metadata of file 0; notes: the reader's notes of the file.
pixel_run visit_curve_file(const std::vector<std::string>& files, std::size_t i, unsigned slot, const grid_visitor& visit,
                           const reader_options& options, curve_metadata& first_metadata, std::vector<std::string>& notes) {
    const measured_curve c = read_curve_csv(files[i], options);
    notes = c.notes;
    if (!c.metadata.x_m || !c.metadata.y_m) {
        throw_input(location{files[i], 0, 0, c.metadata.x_m ? "y" : "x"},
                    "no lateral position in the metadata; every file of a grid directory needs "
                    "'# x: <length>' and '# y: <length>' lines, e.g. '# x: 1.5 nm'");
    }
    if (i == 0) first_metadata = c.metadata;
    const curve_sweep& s = c.sweeps.front();
    grid_pixel_view v;
    v.x_m = *c.metadata.x_m;
    v.y_m = *c.metadata.y_m;
    v.z_m = s.z_m;
    v.current_A = s.current_A;
    v.bias_V = c.metadata.bias_V ? *c.metadata.bias_V : std::numeric_limits<double>::quiet_NaN();
    v.where = location{files[i], 0, 0, ""};
    visit(v, slot);
    return pixel_run{v.x_m, v.y_m, 0, s.z_m.size(), static_cast<std::uint32_t>(i)};
}

// Workers that take the files in name order and visit them; the first failing file in that order
// is the one reported, whatever the thread count.
class directory_reader {
public:
    directory_reader(const std::vector<std::string>& files, const grid_visitor& visit, const reader_options& options,
                     curve_metadata& first_metadata)
        : files_(files), visit_(visit), options_(curve_options(options)), first_metadata_(first_metadata),
          runs_(files.size()), notes_(files.size()), failures_(files.size()), first_failure_(files.size()) {}

    // The notes of the first file that has any, naming it, and how many more files have notes.
    std::vector<std::string> notes() const {
        std::vector<std::string> out;
        std::size_t more = 0;
        for (std::size_t i = 0; i < files_.size(); ++i) {
            if (notes_[i].empty()) continue;
            if (out.empty()) {
                for (const std::string& n : notes_[i]) out.push_back(fmt::format("{}: {}", files_[i], n));
            } else {
                ++more;
            }
        }
        if (more > 0) out.push_back(fmt::format("the same for {} more file{}", more, more == 1 ? "" : "s"));
        return out;
    }

    // Runs `workers` threads to the end, reporting progress (bytes of the files done, of `total`)
    // from the calling thread; rethrows the first failure. Returns the runs in file order.
    std::vector<pixel_run> run(unsigned workers, const std::vector<std::uint64_t>& sizes, std::uint64_t total,
                               const grid_read_options& options) {
        sizes_ = &sizes;
        running_ = workers;
        std::vector<std::thread> pool;
        for (unsigned w = 0; w < workers; ++w) pool.emplace_back([this, w] { work(w); });
        {
            std::unique_lock lock(m_);
            while (!finished_.wait_for(lock, std::chrono::milliseconds(100), [&] { return running_.load() == 0; })) {
                if (options.progress) {
                    lock.unlock();
                    options.progress(std::min(done_bytes_.load(), total), total);
                    lock.lock();
                }
            }
        }
        for (auto& t : pool) t.join();
        if (first_failure_.load() < files_.size()) std::rethrow_exception(failures_[first_failure_.load()]);
        return std::move(runs_);
    }

private:
    void work(unsigned slot) {
        for (;;) {
            const std::size_t i = next_.fetch_add(1);
            // Files after a failure need not be read: only an earlier failure could replace it.
            if (i >= files_.size() || i > first_failure_.load()) break;
            try {
                runs_[i] = visit_curve_file(files_, i, slot, visit_, options_, first_metadata_, notes_[i]);
            } catch (...) {
                failures_[i] = std::current_exception();
                std::size_t f = first_failure_.load();
                while (i < f && !first_failure_.compare_exchange_weak(f, i)) {
                }
            }
            done_bytes_ += (*sizes_)[i];
        }
        {
            std::lock_guard lock(m_);
            --running_;
        }
        finished_.notify_all();
    }

    const std::vector<std::string>& files_;
    const grid_visitor& visit_;
    const reader_options options_;
    curve_metadata& first_metadata_;
    const std::vector<std::uint64_t>* sizes_ = nullptr;
    std::vector<pixel_run> runs_;
    std::vector<std::vector<std::string>> notes_;
    std::vector<std::exception_ptr> failures_;
    std::atomic<std::size_t> next_{0}, first_failure_;
    std::atomic<std::uint64_t> done_bytes_{0};
    std::atomic<unsigned> running_{0};
    std::mutex m_;
    std::condition_variable finished_;
};

}  // namespace

grid_layout read_grid_directory(const std::string& path, const grid_read_options& options, const grid_visitor& visit) {
    options.reader.validate(4);
    grid_layout layout;
    layout.path = path;
    layout.directory = true;
    const std::vector<std::string> files = list_curve_files(path);
    std::vector<std::uint64_t> sizes;
    std::uint64_t total = 0;
    std::error_code ec;
    for (const std::string& f : files) {
        sizes.push_back(std::filesystem::file_size(f, ec));
        total += ec ? 0 : sizes.back();
    }
    const unsigned workers = std::min<unsigned>(resolved_threads(options), static_cast<unsigned>(files.size()));
    directory_reader reader(files, visit, options.reader, layout.metadata);
    const std::vector<pixel_run> runs = reader.run(workers, sizes, total, options);
    layout.notes = reader.notes();
    if (options.progress) options.progress(total, total);
    for (const pixel_run& r : runs) layout.samples += r.samples;
    layout.bytes = total;
    check_grid(runs, files, false, layout, options.partial);
    return layout;
}

}  // namespace tipgap::detail
