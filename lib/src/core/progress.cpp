// The progress line (progress.hpp).
#include "tipgap/core/progress.hpp"

#include <atomic>
#include <condition_variable>
#include <cstdio>
#include <cstdlib>
#include <fmt/format.h>
#include <mutex>
#include <thread>
#include <unistd.h>

#include "tipgap/core/interrupt.hpp"

namespace tipgap {
namespace {
std::atomic<std::uint64_t> g_done{0};
std::atomic<std::uint64_t> g_total{0};
std::atomic<bool> g_active{false};
}  // namespace

struct progress_scope::state {
    std::string label;
    std::chrono::milliseconds delay;
    std::mutex m;
    std::condition_variable wake;
    bool stop = false;
    bool shown = false;
    std::thread drawer;

    void draw(double seconds) {
        const std::uint64_t total = g_total.load(), done = std::min(g_done.load(), total);
        const std::string line =
            total > 0 ? fmt::format("{}: {:3.0f}% ({} of {}) {:.1f} s", label, 100.0 * static_cast<double>(done) / static_cast<double>(total),
                                    done, total, seconds)
                      : fmt::format("{}: working, {:.1f} s", label, seconds);
        const std::string out = "\r\033[K" + line;
        (void)!::write(STDERR_FILENO, out.data(), out.size());
        shown = true;
        set_progress_line_shown(true);
    }

    void run() {
        const auto t0 = std::chrono::steady_clock::now();
        std::unique_lock<std::mutex> lock(m);
        if (wake.wait_for(lock, delay, [&] { return stop; })) return;
        while (!stop && !interrupted()) {
            draw(std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count());
            wake.wait_for(lock, std::chrono::milliseconds(250), [&] { return stop; });
        }
    }
};

progress_scope::progress_scope(std::string label, bool enabled, std::chrono::milliseconds delay) {
    if (!enabled || !::isatty(STDERR_FILENO) || g_active.exchange(true)) return;
    g_done = 0;
    g_total = 0;
    s_ = std::make_unique<state>();
    s_->label = std::move(label);
    // TIPGAP_PROGRESS_DELAY_MS shortens (or lengthens) the silent start, for tests on fast machines.
    const char* env = std::getenv("TIPGAP_PROGRESS_DELAY_MS");
    s_->delay = env && *env ? std::chrono::milliseconds(std::strtol(env, nullptr, 10)) : delay;
    s_->drawer = std::thread([s = s_.get()] { s->run(); });
}

progress_scope::~progress_scope() {
    if (!s_) return;
    {
        std::lock_guard<std::mutex> lock(s_->m);
        s_->stop = true;
    }
    s_->wake.notify_all();
    s_->drawer.join();
    if (s_->shown) {
        set_progress_line_shown(false);
        (void)!::write(STDERR_FILENO, "\r\033[K", 4);
    }
    g_total = 0;
    g_active = false;
}

void report_progress(std::uint64_t done, std::uint64_t total) {
    if (!g_active.load(std::memory_order_relaxed)) return;
    g_total.store(total, std::memory_order_relaxed);
    g_done.store(done, std::memory_order_relaxed);
}

bool progress_active() { return g_active.load(); }

}  // namespace tipgap
