#pragma once
// One progress facility for long work (predict grids, Monte Carlo draws, maps, any run over about
// two seconds). A command opens one progress_scope; library loops report how far they are with
// report_progress(), which costs two atomic stores and does nothing without an open scope. A
// background thread draws one line on stderr, starting after `delay` and redrawn four times a
// second: "tipgap predict: 45% (450000 of 1000000) 3.1 s", or "tipgap predict: working, 3.1 s"
// while no loop reports. Nothing is drawn when stderr is not a terminal or the scope is disabled
// (--quiet). The line is cleared when the scope ends; an interrupt (core/interrupt.hpp) ends it
// with a newline first.
#include <chrono>
#include <cstdint>
#include <memory>
#include <string>

namespace tipgap {

class progress_scope {
public:
    // label: what the line starts with ("tipgap predict"); enabled: false for --quiet; delay:
    // how long a run stays silent (default 1.5 s; the environment variable TIPGAP_PROGRESS_DELAY_MS
    // overrides it). Draws only when stderr is a terminal.
    progress_scope(std::string label, bool enabled,
                   std::chrono::milliseconds delay = std::chrono::milliseconds(1500));
    progress_scope(const progress_scope&) = delete;
    progress_scope& operator=(const progress_scope&) = delete;
    ~progress_scope();

    struct state;

private:
    std::unique_ptr<state> s_;
};

// done of total units of the current long step (points, draws, bytes); total 0 clears it.
// Thread-safe; cheap enough for every item of a loop.
void report_progress(std::uint64_t done, std::uint64_t total);

// True while a scope draws (for tests and for code that wants to skip its own messages).
bool progress_active();

}  // namespace tipgap
