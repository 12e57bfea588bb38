#pragma once
// The one-line text of an error as users see it, shared by the CLI (stderr) and the Python module
// (the message of tipgap.Error), so that both say the same thing in the same words:
//   tipgap: <kind>: <file>:<line>:<column>: <key>: <what was wrong>; expected <what was expected>
#include <string>

#include "tipgap/core/error.hpp"

namespace tipgap {

// "error" (input), "usage error" (usage) or "no answer" (no_answer).
const char* error_label(error_kind kind);

// Replaces line breaks and other control bytes by spaces, so that a message is always one line.
std::string one_line(std::string text);

// "tipgap: <label>: <what>" on one line.
std::string error_line(const error& e);

// Exit code of an internal error (a bug): EX_SOFTWARE of sysexits.h.
inline constexpr int internal_error_exit = 70;

// The one line and the exit code of the exception being handled (call it inside a catch block): a
// tipgap::error gives error_line and its kind's code (README "Exit codes"); anything else is an
// internal error, exit internal_error_exit, with "out of memory" for std::bad_alloc.
struct failure {
    std::string line;
    int exit_code = internal_error_exit;
};
failure current_failure();

}  // namespace tipgap
