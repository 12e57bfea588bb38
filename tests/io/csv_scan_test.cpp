// The CSV scanner under both readers: cells and columns, number parsing, and the fast number path
// against std::from_chars.
#include <gtest/gtest.h>

#include <charconv>
#include <cmath>
#include <fmt/format.h>
#include <random>
#include <string>
#include <string_view>
#include <system_error>
#include <vector>

#include "io/detail/csv_scan.hpp"

using namespace tipgap;

TEST(csv_scan, cells_columns_and_numbers) {
    detail::cell_cursor cells(" 1.5 ,\t-2e-3,+7\r");
    std::string_view cell;
    int column = 0;
    ASSERT_TRUE(cells.next(cell, column));
    EXPECT_EQ(cell, "1.5");
    EXPECT_EQ(column, 2);
    ASSERT_TRUE(cells.next(cell, column));
    EXPECT_EQ(cell, "-2e-3");
    EXPECT_EQ(column, 8);
    ASSERT_TRUE(cells.next(cell, column));
    EXPECT_EQ(cell, "+7");
    EXPECT_FALSE(cells.next(cell, column));
    double v = 0;
    EXPECT_EQ(detail::parse_double("+7", v), detail::number_status::ok);
    EXPECT_EQ(v, 7.0);
    EXPECT_EQ(detail::parse_double("1.5x", v), detail::number_status::not_a_number);
    EXPECT_EQ(detail::parse_double("NaN", v), detail::number_status::not_finite);
    EXPECT_EQ(detail::parse_double("", v), detail::number_status::empty);
    EXPECT_EQ(detail::count_cells("a,b,,c"), 4);
}

// Reference: std::from_chars (C++17, correctly rounded). The fast path must give the same bits.
TEST(grid_scan, fast_number_path_matches_from_chars_bit_for_bit) {
    std::vector<std::string> cases = {"0",      "-0",        "1",         "+1.5",     "0.1",      "0.30000000000000004",
                                      "123.456", "-0.000001", "9007199254740992", "9007199254740993",
                                      "12345678901234567890", "1e5", "1.5E-3", ".5", "5.", "0.0000000000000000000001",
                                      "1234567.1234567", "-999.999", "4.9406564584124654e-324", "1.7976931348623157e308"};
    std::mt19937_64 rng(3);
    for (int k = 0; k < 20000; ++k) {
        std::uniform_real_distribution<double> mag(-30.0, 30.0);
        const double v = std::pow(10.0, mag(rng)) * (k % 2 ? -1.0 : 1.0);
        const int digits = 1 + static_cast<int>(rng() % 17);
        cases.push_back(fmt::format("{:.{}f}", v, std::min(digits, 25)));
        cases.push_back(fmt::format("{:.{}g}", v, digits));
    }
    for (const std::string& s : cases) {
        double fast = 0.0, ref = 0.0;
        const char* end = s.data() + s.size();
        const char* p = detail::scan_number(s.data(), end, fast);
        const char* start = s[0] == '+' ? s.data() + 1 : s.data();
        const auto [q, ec] = std::from_chars(start, end, ref);
        ASSERT_EQ(ec, std::errc()) << s;
        ASSERT_NE(p, nullptr) << s;
        EXPECT_EQ(p, q) << s;
        EXPECT_EQ(std::signbit(fast), std::signbit(ref)) << s;
        EXPECT_EQ(fast, ref) << s;
    }
    double v = 0.0;
    const std::string bad[] = {"abc", "-", "nan", "inf", "1e999", "+-1", ""};
    for (const std::string& s : bad) EXPECT_EQ(detail::scan_number(s.data(), s.data() + s.size(), v), nullptr) << s;
}
