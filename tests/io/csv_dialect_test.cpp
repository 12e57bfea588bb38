// The row scanner's dialects (io/detail/csv_scan.hpp): delimiter detection, cells of each
// dialect with their columns, trailing empty cells, decimal commas, and the fast number scan with
// a decimal comma bit for bit equal to std::from_chars on the same number with a point.
#include <gtest/gtest.h>

#include <charconv>
#include <cstring>
#include <random>
#include <string>
#include <string_view>
#include <vector>

#include "io/detail/csv_scan.hpp"

using namespace tipgap::detail;

namespace {

// The cells of a line with their columns, as "cell@column".
std::vector<std::string> cells_of(std::string_view line, csv_dialect d) {
    std::vector<std::string> out;
    cell_cursor cells(line, d);
    std::string_view cell;
    int column = 0;
    while (cells.next(cell, column)) out.push_back(std::string(cell) + "@" + std::to_string(column));
    return out;
}

csv_dialect dialect(char delimiter) { return csv_dialect{delimiter, delimiter != ','}; }

}  // namespace

TEST(csv_scan, delimiter_detected_tab_then_semicolon_then_comma_then_whitespace) {
    EXPECT_EQ(detect_dialect("z [nm]\tcurrent, filtered [pA]", false).delimiter, '\t');
    EXPECT_EQ(detect_dialect("z [nm];current [pA]", false).delimiter, ';');
    EXPECT_EQ(detect_dialect("z [nm],current [pA]", false).delimiter, ',');
    EXPECT_EQ(detect_dialect("z/nm  current/pA", false).delimiter, ' ');
    // A numeric first row: commas inside whitespace-separated cells are decimal commas.
    EXPECT_EQ(detect_dialect("0,25 40", true).delimiter, ' ');
    EXPECT_EQ(detect_dialect("0.25, 40", true).delimiter, ',');
    EXPECT_FALSE(detect_dialect("z [nm],current [pA]", false).decimal_comma);
    EXPECT_TRUE(detect_dialect("z [nm];current [pA]", false).decimal_comma);
    EXPECT_STREQ(detect_dialect("a\tb", false).name(), "tab");
}

TEST(csv_scan, cells_and_columns_in_each_dialect) {
    EXPECT_EQ(cells_of(" 1.5 ,\t-2e-3,+7\r", dialect(',')), (std::vector<std::string>{"1.5@2", "-2e-3@8", "+7@14"}));
    EXPECT_EQ(cells_of("1,5\t 2 \t3,0\r", dialect('\t')), (std::vector<std::string>{"1,5@1", "2@6", "3,0@9"}));
    EXPECT_EQ(cells_of("a; b ;", dialect(';')), (std::vector<std::string>{"a@1", "b@4", "@7"}));
    EXPECT_EQ(cells_of("  1,5 \t 2   3\r", dialect(' ')), (std::vector<std::string>{"1,5@3", "2@9", "3@13"}));
    EXPECT_TRUE(cells_of(" \t\r", dialect(' ')).empty());
}

TEST(csv_scan, counts_with_and_without_trailing_empty_cells) {
    EXPECT_EQ(count_cells("1,2,,", dialect(',')), 4);
    EXPECT_EQ(count_filled_cells("1,2,,", dialect(',')), 2);
    EXPECT_EQ(count_filled_cells("1,,3", dialect(',')), 3);
    EXPECT_EQ(count_cells("1 2   3 ", dialect(' ')), 3);
    // What a message reports: all cells when too few, the filled ones when too many.
    EXPECT_EQ(reported_cell_count("1,", dialect(','), 3), 2);
    EXPECT_EQ(reported_cell_count("1,2,3,4,,", dialect(','), 3), 4);
}

TEST(csv_scan, decimal_comma_cells) {
    double v = 0.0;
    EXPECT_EQ(parse_cell("0,25", dialect('\t'), v), number_status::ok);
    EXPECT_EQ(v, 0.25);
    EXPECT_EQ(parse_cell("-1,5e-3", dialect(';'), v), number_status::ok);
    EXPECT_EQ(v, -1.5e-3);
    EXPECT_EQ(parse_cell("1.234,5", dialect(';'), v), number_status::not_a_number);  // thousands separator
    EXPECT_EQ(parse_cell("1,2,3", dialect(';'), v), number_status::not_a_number);
    EXPECT_EQ(parse_cell("0,25", dialect(','), v), number_status::not_a_number);  // a comma file has no decimal comma
    EXPECT_EQ(parse_cell("0.25", dialect('\t'), v), number_status::ok);          // a point is still read
    EXPECT_EQ(v, 0.25);
}

// The fast scan with a decimal comma gives, bit for bit, what std::from_chars gives for the same
// digits with a point; a comma number that needs from_chars (an exponent) is left to the caller.
TEST(csv_scan, fast_scan_with_decimal_comma_matches_from_chars) {
    std::mt19937_64 rng(5);
    std::uniform_int_distribution<int> digits(1, 9), places(0, 8), lead(0, 5000);
    for (int k = 0; k < 20000; ++k) {
        std::string point = std::to_string(lead(rng));
        const int n = places(rng);
        if (n > 0) point += ".";
        for (int j = 0; j < n; ++j) point += static_cast<char>('0' + digits(rng));
        std::string comma = point;
        for (char& c : comma)
            if (c == '.') c = ',';
        double expected = 0.0, got = 0.0;
        std::from_chars(point.data(), point.data() + point.size(), expected);
        const char* end = scan_number(comma.data(), comma.data() + comma.size(), got, ',');
        ASSERT_EQ(end, comma.data() + comma.size()) << comma;
        ASSERT_EQ(std::memcmp(&expected, &got, sizeof got), 0) << comma;
    }
    const std::string exp = "1,5e-3";
    double v = 0.0;
    EXPECT_EQ(scan_number(exp.data(), exp.data() + exp.size(), v, ','), nullptr);
    const std::string dot = "1.5e-3";
    EXPECT_EQ(scan_number(dot.data(), dot.data() + dot.size(), v, ','), dot.data() + dot.size());
    EXPECT_EQ(v, 1.5e-3);
}
