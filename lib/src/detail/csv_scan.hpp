#pragma once
// Low-level CSV scanning shared by the curve reader and (later) the grid reader: walk a buffer
// line by line, split a row into cells and parse numbers with std::from_chars, all without
// allocating. Only the plain dialect tipgap reads is supported: comma separated, no quoting,
// optional spaces/tabs around cells, LF or CRLF line ends.
#include <charconv>
#include <cmath>
#include <cstddef>
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
    explicit line_cursor(std::string_view text) : text_(text) {}
    // Sets `line` to the next line (without its '\n'; a '\r' is kept and trimmed by the cell
    // functions) and returns true, or returns false at the end of the buffer.
    bool next(std::string_view& line) {
        if (pos_ >= text_.size()) return false;
        std::size_t end = text_.find('\n', pos_);
        if (end == std::string_view::npos) end = text_.size();
        line = text_.substr(pos_, end - pos_);
        pos_ = end + 1;
        ++line_number_;
        return true;
    }
    int line_number() const { return line_number_; }

private:
    std::string_view text_;
    std::size_t pos_ = 0;
    int line_number_ = 0;
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

}  // namespace tipgap::detail
