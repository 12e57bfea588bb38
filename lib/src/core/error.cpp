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

namespace {

// Length of the valid UTF-8 sequence at text[i] (2 to 4), or 0 when the bytes there are not one.
std::size_t utf8_length(std::string_view text, std::size_t i) {
    const auto b = static_cast<unsigned char>(text[i]);
    const std::size_t n = b >= 0xF0 && b <= 0xF4 ? 4 : b >= 0xE0 ? 3 : b >= 0xC2 && b < 0xE0 ? 2 : 0;
    if (n == 0 || i + n > text.size()) return 0;
    for (std::size_t k = 1; k < n; ++k)
        if ((static_cast<unsigned char>(text[i + k]) & 0xC0) != 0x80) return 0;
    return n;
}

// Control bytes (a newline inside a library's message, an escape sequence in a file name) and
// bytes that are not UTF-8 (a Latin-1 file name) become \xNN, so that every message is one
// printable line of valid text.
std::string printable_text(std::string_view s) {
    std::string out;
    out.reserve(s.size());
    for (std::size_t i = 0; i < s.size();) {
        const auto c = static_cast<unsigned char>(s[i]);
        if (c < 0x20 || c == 0x7F) {
            out += fmt::format("\\x{:02X}", c);
            ++i;
        } else if (c < 0x80) {
            out += s[i++];
        } else if (const std::size_t n = utf8_length(s, i); n > 0) {
            out.append(s.substr(i, n));
            i += n;
        } else {
            out += fmt::format("\\x{:02X}", c);
            ++i;
        }
    }
    return out;
}

std::string printable(const std::string& s) { return printable_text(s); }

}  // namespace

std::string quote_input(std::string_view text, std::size_t max_bytes) {
    bool cut = text.size() > max_bytes;
    if (cut) {
        std::size_t n = max_bytes;
        // Do not split a UTF-8 sequence: back up over continuation bytes (10xxxxxx).
        while (n > 0 && (static_cast<unsigned char>(text[n]) & 0xC0) == 0x80) --n;
        text = text.substr(0, n);
    }
    std::string out = "'" + printable_text(text);
    out += cut ? "...'" : "'";
    return out;
}


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
