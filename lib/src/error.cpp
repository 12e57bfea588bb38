#include "tipgap/error.hpp"

#include <fmt/format.h>

namespace tipgap {

std::string format_location(const location& w) {
    std::string out;
    if (!w.file.empty()) {
        out += w.file;
        if (w.line > 0) {
            out += fmt::format(":{}", w.line);
            if (w.column > 0) out += fmt::format(":{}", w.column);
        }
        out += ": ";
    }
    if (!w.key.empty()) out += w.key + ": ";
    return out;
}

error::error(error_kind kind, const location& where, const std::string& what)
    : std::runtime_error(format_location(where) + what), kind_(kind), where_(where), detail_(what) {}

void throw_input(const location& where, const std::string& what) {
    throw error(error_kind::input, where, what);
}

void throw_usage(const std::string& option, const std::string& what) {
    location w;
    w.key = option;
    throw error(error_kind::usage, w, what);
}

}  // namespace tipgap
