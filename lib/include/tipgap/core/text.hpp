#pragma once
// Text from a user (labels, file names, command lines) written into a line-oriented file.
#include <string>
#include <string_view>

namespace tipgap {

// `text` with every control byte (newline, carriage return, tab, escape, DEL) written as \xNN, so
// that a label holding "\n# bias: 5 V" stays on its own metadata line and cannot add another.
std::string single_line(std::string_view text);

}  // namespace tipgap
