#include "core/detail/parallel.hpp"

#include "tipgap/core/progress.hpp"

#include <algorithm>
#include <atomic>
#include <exception>
#include <mutex>
#include <thread>
#include <vector>

namespace tipgap::detail {

namespace {
// The outermost parallel_for of a run reports its progress (core/progress.hpp); nested ones, on
// worker threads, would make the line jump between loops.
std::atomic<bool> reporting{false};

struct reporter {
    bool owner = !reporting.exchange(true);
    std::size_t n;
    std::atomic<std::size_t> done{0};
    void tick() {
        if (owner) report_progress(done.fetch_add(1) + 1, n);
    }
    ~reporter() {
        if (!owner) return;
        report_progress(0, 0);
        reporting = false;
    }
};
}  // namespace

void parallel_for(std::size_t n, int threads, const std::function<void(std::size_t)>& f) {
    reporter progress{.n = n};
    unsigned hw = std::max(1u, std::thread::hardware_concurrency());
    std::size_t workers = threads > 0 ? static_cast<std::size_t>(threads) : hw;
    workers = std::min(workers, n);
    if (workers <= 1) {
        for (std::size_t i = 0; i < n; ++i) {
            f(i);
            progress.tick();
        }
        return;
    }
    std::atomic<std::size_t> next{0};
    std::exception_ptr failure;
    std::mutex m;
    auto work = [&] {
        for (;;) {
            std::size_t i = next.fetch_add(1);
            if (i >= n) return;
            try {
                f(i);
                progress.tick();
            } catch (...) {
                std::lock_guard<std::mutex> lock(m);
                if (!failure) failure = std::current_exception();
                next = n;
                return;
            }
        }
    };
    std::vector<std::thread> pool;
    for (std::size_t t = 0; t < workers; ++t) pool.emplace_back(work);
    for (auto& t : pool) t.join();
    if (failure) std::rethrow_exception(failure);
}

}  // namespace tipgap::detail
