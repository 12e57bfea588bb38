#include "tipgap/core/error.hpp"

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

std::string quote_input(std::string_view text, std::size_t max_bytes) {
    bool cut = text.size() > max_bytes;
    if (cut) {
        std::size_t n = max_bytes;
        // Do not split a UTF-8 sequence: back up over continuation bytes (10xxxxxx).
        while (n > 0 && (static_cast<unsigned char>(text[n]) & 0xC0) == 0x80) --n;
        text = text.substr(0, n);
    }
    std::string out = "'";
    for (char ch : text) {
        auto c = static_cast<unsigned char>(ch);
        if (c < 0x20 || c == 0x7F) {
            out += fmt::format("\\x{:02X}", c);
        } else {
            out += ch;
        }
    }
    out += cut ? "...'" : "'";
    return out;
}

namespace {
// Control bytes (a newline inside a library's message, an escape sequence in a file name) become
// \xNN, so that every message is one printable line.
std::string printable(const std::string& s) {
    std::string out;
    out.reserve(s.size());
    for (char ch : s) {
        auto c = static_cast<unsigned char>(ch);
        if (c < 0x20 || c == 0x7F) {
            out += fmt::format("\\x{:02X}", c);
        } else {
            out += ch;
        }
    }
    return out;
}
}  // namespace

error::error(error_kind kind, const location& where, const std::string& what)
    : std::runtime_error(printable(format_location(where) + what)), kind_(kind), where_(where),
      detail_(printable(what)) {}

void throw_input(const location& where, const std::string& what) {
    throw error(error_kind::input, where, what);
}

void throw_usage(const std::string& option, const std::string& what) {
    location w;
    w.key = option;
    throw error(error_kind::usage, w, what);
}

}  // namespace tipgap
