#include "core/detail/parallel.hpp"

#include <algorithm>
#include <atomic>
#include <exception>
#include <mutex>
#include <thread>
#include <vector>

namespace tipgap::detail {

void parallel_for(std::size_t n, int threads, const std::function<void(std::size_t)>& f) {
    unsigned hw = std::max(1u, std::thread::hardware_concurrency());
    std::size_t workers = threads > 0 ? static_cast<std::size_t>(threads) : hw;
    workers = std::min(workers, n);
    if (workers <= 1) {
        for (std::size_t i = 0; i < n; ++i) f(i);
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
