#pragma once
// Values given on the command line as one quantity, a list "a,b,c", or a range "FROM..TO" with
// --points values: syntax of the command line, so it lives here and not in the library.
#include <cstddef>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "tipgap/core/units.hpp"

namespace tipgap::cli {

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
