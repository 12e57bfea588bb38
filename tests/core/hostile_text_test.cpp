// Text from anywhere (issue 11, classes 5, 6 and 8): look-alike unit characters, inclusive limits
// with a relative tolerance, control bytes in metadata, invalid UTF-8 in JSON.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>
#include <string>

#include "tipgap/core/error.hpp"
#include "tipgap/core/limits.hpp"
#include "tipgap/core/text.hpp"
#include "tipgap/core/units.hpp"
#include "tipgap/io/columns.hpp"

using namespace tipgap;

TEST(units, look_alike_characters_are_read_as_the_usual_ones) {
    const location w{"", 0, 0, "value"};
    EXPECT_DOUBLE_EQ(parse_quantity("77 \u212A", dimension::temperature, w), 77.0);      // KELVIN SIGN
    EXPECT_DOUBLE_EQ(parse_quantity("6 \u212B", dimension::length, w), 6e-10);           // ANGSTROM SIGN
    EXPECT_DOUBLE_EQ(parse_quantity("\u2212100 mV", dimension::voltage, w), -0.1);       // MINUS SIGN
    EXPECT_DOUBLE_EQ(parse_quantity("0.6\u00A0nm", dimension::length, w), 0.6e-9);       // NO-BREAK SPACE
    EXPECT_DOUBLE_EQ(parse_quantity("1 \u03BCA", dimension::current, w), 1e-6);          // GREEK SMALL MU
    EXPECT_DOUBLE_EQ(parse_quantity("1 \u00B5A", dimension::current, w), 1e-6);          // MICRO SIGN
    try {
        parse_quantity("77 \u2103", dimension::temperature, w);  // DEGREE CELSIUS
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_NE(std::string(e.what()).find("U+2103"), std::string::npos) << e.what();
    }
}

TEST(limits, inclusive_limits_allow_a_relative_tolerance) {
    EXPECT_TRUE(at_most(100 * 1e-9, 100e-9));
    EXPECT_TRUE(at_most(100e-9 * (1 + 1e-13), 100e-9));
    EXPECT_FALSE(at_most(100e-9 * (1 + 1e-9), 100e-9));
    EXPECT_FALSE(at_most(std::numeric_limits<double>::infinity(), 100e-9));
    EXPECT_TRUE(at_least(1.0 - 1e-14, 1.0));
    EXPECT_FALSE(at_least(0.999, 1.0));
}

TEST(text, control_bytes_cannot_start_a_new_line) {
    EXPECT_EQ(single_line("Au\n# bias: 5 V"), "Au\\x0A# bias: 5 V");
    EXPECT_EQ(single_line("W\r\x1b[31m"), "W\\x0D\\x1B[31m");
    EXPECT_EQ(single_line("Au(111) µ"), "Au(111) µ");
}

TEST(json_text, invalid_utf8_is_replaced_and_flagged) {
    record r;
    r.set("file", std::string("bad\xff\xfename.csv"));
    const nlohmann::json j = nlohmann::json::parse(json_text(r));
    EXPECT_EQ(j["file"].get<std::string>(), "bad\uFFFD\uFFFDname.csv");
    EXPECT_TRUE(j["invalid_utf8_replaced"].get<bool>());
    record ok;
    ok.set("file", std::string("good.csv"));
    EXPECT_FALSE(nlohmann::json::parse(json_text(ok)).contains("invalid_utf8_replaced"));
}

TEST(error, bytes_that_are_not_utf8_are_shown_as_hex) {
    EXPECT_EQ(quote_input("z [\xb5m]"), "'z [\\xB5m]'");
    EXPECT_EQ(quote_input("z [\u00b5m]"), "'z [\u00b5m]'");
    const error e(error_kind::input, location{"bad\xff.csv", 0, 0, ""}, "cannot read");
    EXPECT_EQ(std::string(e.what()), "bad\\xFF.csv: cannot read");
}
