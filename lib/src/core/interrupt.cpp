// Signal handlers that remove the run's temporaries (see interrupt.hpp).
#include "tipgap/core/interrupt.hpp"

#include <atomic>
#include <csignal>
#include <cstring>
#include <dirent.h>
#include <fcntl.h>
#include <sys/syscall.h>
#include <unistd.h>

namespace tipgap {
namespace {

constexpr int slot_count = 64;
constexpr std::size_t path_capacity = 4096;

// state: 0 free, 1 being written by its owner, 2 live file, 3 live directory.
struct slot {
    std::atomic<int> state{0};
    char path[path_capacity];
};
slot slots[slot_count];

std::atomic<int> received{0};
std::atomic<bool> progress_shown{false};
std::atomic<bool> installed{false};

const int handled_signals[] = {SIGINT, SIGTERM, SIGHUP, SIGPIPE};

// Removes the entries of a flat directory with getdents64 (opendir allocates: not signal-safe).
void remove_flat_directory(const char* path) {
    const int fd = ::open(path, O_RDONLY | O_DIRECTORY | O_CLOEXEC | O_NOFOLLOW);
    if (fd >= 0) {
        alignas(8) char buf[4096];
        for (;;) {
            const long n = ::syscall(SYS_getdents64, fd, buf, sizeof buf);
            if (n <= 0) break;
            for (long off = 0; off < n;) {
                // struct linux_dirent64: d_ino (8), d_off (8), d_reclen (2), d_type (1), d_name
                unsigned short reclen;
                std::memcpy(&reclen, buf + off + 16, sizeof reclen);
                const char* name = buf + off + 19;
                if (std::strcmp(name, ".") != 0 && std::strcmp(name, "..") != 0) ::unlinkat(fd, name, 0);
                off += reclen;
            }
        }
        ::close(fd);
    }
    ::rmdir(path);
}

extern "C" void on_signal(int sig) {
    int expected = 0;
    if (!received.compare_exchange_strong(expected, sig)) return;  // already ending
    if (progress_shown.load()) (void)!::write(2, "\n", 1);
    for (slot& s : slots) {
        const int st = s.state.load();
        if (st == 2) ::unlink(s.path);
        if (st == 3) remove_flat_directory(s.path);
    }
    ::_exit(128 + sig);
}

}  // namespace

void install_interrupt_handlers() {
    if (installed.exchange(true)) return;
    struct sigaction sa {};
    sa.sa_handler = on_signal;
    sigemptyset(&sa.sa_mask);
    for (int s : handled_signals) sigaddset(&sa.sa_mask, s);  // one handler at a time
    for (int s : handled_signals) {
        struct sigaction old {};
        ::sigaction(s, nullptr, &old);
        // A signal ignored by whoever started us (nohup, a shell's background job) stays ignored.
        if (old.sa_handler == SIG_IGN && s != SIGPIPE) continue;
        ::sigaction(s, &sa, nullptr);
    }
}

bool interrupted() { return received.load() != 0; }

void set_progress_line_shown(bool shown) { progress_shown.store(shown); }

registered_temporary::registered_temporary(const std::string& path, bool directory) {
    if (path.size() + 1 > path_capacity) return;
    for (int i = 0; i < slot_count; ++i) {
        int expected = 0;
        if (!slots[i].state.compare_exchange_strong(expected, 1)) continue;
        std::memcpy(slots[i].path, path.c_str(), path.size() + 1);
        slots[i].state.store(directory ? 3 : 2);
        slot_ = i;
        return;
    }
}

registered_temporary::~registered_temporary() { release(); }

void registered_temporary::release() {
    if (slot_ >= 0) slots[slot_].state.store(0);
    slot_ = -1;
}

interrupts_held::interrupts_held() {
    static_assert(sizeof(sigset_t) <= sizeof(saved_));
    sigset_t block;
    sigemptyset(&block);
    for (int s : handled_signals) sigaddset(&block, s);
    ::pthread_sigmask(SIG_BLOCK, &block, reinterpret_cast<sigset_t*>(saved_));
}

interrupts_held::~interrupts_held() { ::pthread_sigmask(SIG_SETMASK, reinterpret_cast<sigset_t*>(saved_), nullptr); }

}  // namespace tipgap
