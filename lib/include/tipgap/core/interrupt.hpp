#pragma once
// Interrupts (SIGINT, SIGTERM, SIGHUP) and a closed output pipe (SIGPIPE) end a run cleanly: the
// handler removes every temporary file and directory the run has registered, then ends the
// process with 128 + the signal number (130, 143, 129, 141; README "Exit codes"). The handler uses
// only async-signal-safe calls (unlink, unlinkat, rmdir, write, _exit), so it works at any moment,
// also in the middle of a long computation. Long loops may also poll interrupted() to stop early.
#include <string>

namespace tipgap {

// Installs the handlers (once per process; later calls do nothing). Library users who keep their
// own handlers simply do not call it: the registry below then costs nothing.
void install_interrupt_handlers();

// True once a handled signal has arrived (the handler is then already ending the process; this is
// for code that runs on other threads and wants to stop early).
bool interrupted();

// A temporary file or directory that the interrupt handler removes. Registration is a fixed table
// of 64 slots of paths up to 4095 bytes; a path that does not fit is simply not registered (it is
// still removed by its owner on normal unwinding and as a stale temporary by the next run).
class registered_temporary {
public:
    // path: the temporary; directory: remove the files in it (one level) and then the directory.
    registered_temporary(const std::string& path, bool directory);
    registered_temporary(const registered_temporary&) = delete;
    registered_temporary& operator=(const registered_temporary&) = delete;
    ~registered_temporary();
    // Stops the handler from removing it (the temporary was renamed into place or removed).
    void release();

private:
    int slot_ = -1;
};

// Holds SIGINT, SIGTERM, SIGHUP and SIGPIPE back while alive (a signal arriving meanwhile is
// handled when it ends): used around the final renames so that a run commits all or nothing.
class interrupts_held {
public:
    interrupts_held();
    interrupts_held(const interrupts_held&) = delete;
    interrupts_held& operator=(const interrupts_held&) = delete;
    ~interrupts_held();

private:
    unsigned long saved_[16];  // sigset_t without <signal.h> in the header (128 bytes on Linux)
};

// Called by the progress line (core/progress.hpp) so that the handler ends that line first.
void set_progress_line_shown(bool shown);

}  // namespace tipgap
