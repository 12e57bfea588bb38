// The shape of every user-facing message: one printable line, echoed input clipped. (Inputs that
// once crashed the fitter are in tests/fit/fit_line_test.cpp and tests/fit/fit_sweep_test.cpp.)
#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"

using namespace tipgap;

TEST(error_format, quote_input_clips_long_text_at_a_character_boundary) {
    EXPECT_EQ(quote_input("abc"), "'abc'");
    EXPECT_EQ(quote_input(std::string(61, 'x')), "'" + std::string(60, 'x') + "...'");
    EXPECT_EQ(quote_input(std::string(60, 'x')), "'" + std::string(60, 'x') + "'");
    // "Å" is two bytes (C3 85); a cut after byte 3 of "xxÅÅ" would split the second Å.
    EXPECT_EQ(quote_input("xx\xC3\x85\xC3\x85", 5), "'xx\xC3\x85...'");
}

TEST(error_format, control_bytes_are_shown_not_sent_to_the_terminal) {
    EXPECT_EQ(quote_input("a\x1b[2Jb\n"), "'a\\x1B[2Jb\\x0A'");
    // The error type itself escapes them too, whatever the message was built from (a library's
    // text, a file name).
    error e(error_kind::input, location{"odd\nname.yaml", 2, 1, ""}, "bad\rvalue");
    EXPECT_EQ(std::string(e.what()), "odd\\x0Aname.yaml:2:1: bad\\x0Dvalue");
    EXPECT_EQ(e.detail(), "bad\\x0Dvalue");
}

TEST(error_format, a_ten_megabyte_number_gives_a_short_message) {
    const std::string huge(10'000'000, '7');
    try {
        parse_quantity(huge + " nm", dimension::length, location{"", 0, 0, "--gap"});
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), "--gap: '" + std::string(60, '7') +
                                             "...' is outside the range of a double-precision number; expected a "
                                             "magnitude of 0 or between about 1e-308 and 1e308");
    }
}
