#pragma once
// One exception type for every user-facing error: what was wrong, where, what was expected.
#include <stdexcept>
#include <cstddef>
#include <string>
#include <string_view>

namespace tipgap {

// Exit codes the CLI maps errors to (documented in README "Exit codes").
enum class error_kind {
    usage = 2,      // bad command line: unknown option, missing argument, malformed flag value
    input = 3,      // bad input file or value: YAML, CSV, unit, out-of-range parameter
    no_answer = 4,  // the request is well formed but no answer exists (unreachable setpoint)
};

// Where an error was found; any field may be empty/zero when unknown.
struct location {
    std::string file;    // path as given by the user
    int line = 0;        // 1-based; 0 = unknown
    int column = 0;      // 1-based; 0 = unknown
    std::string key;     // YAML key path (tip.work_function), CSV column or CLI option (--gap)
};

// Formats "file:line:column: key: " (only the parts known).
std::string format_location(const location& where);

class error : public std::runtime_error {
public:
    error(error_kind kind, const location& where, const std::string& what);
    error(error_kind kind, const std::string& what) : error(kind, location{}, what) {}
    error_kind kind() const noexcept { return kind_; }
    const location& where() const noexcept { return where_; }
    // The message without the location prefix.
    const std::string& detail() const noexcept { return detail_; }

private:
    error_kind kind_;
    location where_;
    std::string detail_;
};

// Quotes text taken from the user's input for a message: 'text', cut after `max_bytes` bytes (at a
// UTF-8 character boundary) with "..." and with control bytes shown as \xNN, so that a message
// stays one short line whatever the input holds (a 1 GB line, a binary file, a terminal escape).
std::string quote_input(std::string_view text, std::size_t max_bytes = 60);

// Shorthands.
[[noreturn]] void throw_input(const location& where, const std::string& what);
[[noreturn]] void throw_usage(const std::string& option, const std::string& what);

}  // namespace tipgap
