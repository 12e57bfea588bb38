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

}  // namespace tipgap
