#pragma once
// The boundary between the library's checks and the command line. The library validates its
// options once, with neutral keys (the field names, "gap", "bias"); this file maps each key to
// its flag in ONE table (flags.cpp) and renames the errors, so that no check is written twice.
// Also the values given on the command line as one quantity, a list "a,b,c", or a range
// "FROM..TO" with --points values: syntax of the command line, so it lives here and not in the
// library.
#include <cstddef>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap::cli {

// The flag of a library key in `command`, or "" when no flag sets it.
std::string_view flag_for(std::string_view command, std::string_view key);

// What a renamed error becomes: a usage error (a flag's value broke an option's rule), or an
// error of its own kind (an operating point the model refuses, exit 3 as always).
enum class flag_error { usage, own_kind };

// Called while handling `e`: throws it again naming the flag, or unchanged when its key is no flag's.
[[noreturn]] void rethrow_naming_flag(std::string_view command, flag_error as, const error& e);

// Runs f() and renames the flag of a tipgap::error it throws.
template <class F>
decltype(auto) naming_flags(std::string_view command, flag_error as, F&& f) {
    try {
        return f();
    } catch (const error& e) {
        rethrow_naming_flag(command, as, e);
    }
}

// A flag value with a unit, e.g. "2pA", read by the library's unit parser; a bad value is a usage
// error naming `flag`.
double flag_quantity(const std::string& text, dimension d, const char* flag);

enum class spacing { linear, logarithmic };

// Parses "0.6nm", "0.4nm,0.6nm" or "0.4nm..1.2nm" (a range gets `points` values, ends included; a
// single value or a list ignores `points`). points: >= 2, which the --points flag checks (2 to 1e6).
// step: "" or the --step text (same dimension, linear ranges only): the range then goes FROM..TO
// in steps of that size, which must divide it. Logarithmic spacing needs FROM and TO of the same
// sign, both non-zero. A linear value within 1e-12 of the range's size from 0 is exactly 0. Throws
// tipgap::error naming `flag` on bad text.
std::vector<double> parse_range(std::string_view text, dimension d, int points, spacing sp, const std::string& flag,
                                const std::string& step = "");

// "Z,I" -> {"Z", "I"}: the items between commas, as written ("" -> {""}).
std::vector<std::string> split_list(const std::string& text);

// Every (first, second) pair, with `second` in the outer loop when second_outer.
std::vector<std::pair<double, double>> all_pairs(const std::vector<double>& first, const std::vector<double>& second,
                                                 bool second_outer);

// Refuses (usage error naming `flag`) a grid of more than 1e7 points before it is allocated.
void refuse_huge_grid(std::size_t n_first, std::size_t n_second, const char* flag);

}  // namespace tipgap::cli
