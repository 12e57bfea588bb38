// reader_options: its checks (exact messages, neutral keys that the CLI renames), the settings a
// report shows, the delimiter names and the YAML form the demo scans use.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "tipgap/core/error.hpp"
#include "tipgap/io/reader_options.hpp"

using namespace tipgap;

namespace {

std::string message_of(const reader_options& o, std::size_t roles) {
    try {
        o.validate(roles);
    } catch (const error& e) {
        EXPECT_EQ(e.kind(), error_kind::input);
        return e.what();
    }
    return "(no error)";
}

std::string yaml_file(const std::string& name, const std::string& text) {
    const auto dir = std::filesystem::temp_directory_path() / "tipgap_reader_options_test";
    std::filesystem::create_directories(dir);
    const std::string path = (dir / name).string();
    std::ofstream(path) << text;
    return path;
}

}  // namespace

TEST(reader_options, defaults_are_valid_and_show_no_settings) {
    const reader_options o;
    EXPECT_EQ(message_of(o, 2), "(no error)");
    EXPECT_EQ(message_of(o, 4), "(no error)");
    EXPECT_TRUE(settings(o).empty());
}

TEST(reader_options, bad_values_give_exact_messages_with_neutral_keys) {
    reader_options o;
    o.columns = {"Z"};
    EXPECT_EQ(message_of(o, 2), "columns: 1 column given; expected 2 (z, current), each a header name or a 1-based index");
    o.columns = {"X", "Y", "Z"};
    EXPECT_EQ(message_of(o, 4), "columns: 3 columns given; expected 4 (x, y, z, current), each a header name or a 1-based index");
    o.columns = {"Z", " "};
    EXPECT_EQ(message_of(o, 2), "columns: entry 2 is empty; expected a header name or a 1-based index");
    o.columns = {"0", "2"};
    EXPECT_EQ(message_of(o, 2), "columns: '0' is not a column index; expected 1 or more (indices are 1-based)");
    o.columns = {"z [nm]", "Z"};
    EXPECT_EQ(message_of(o, 2), "columns: 'Z' is given twice; expected one column per role (z, current)");
    o.columns.clear();
    o.z_unit = "furlong";
    EXPECT_EQ(message_of(o, 2), "z_unit: unknown unit 'furlong'; expected a length in m, cm, mm, um, nm, Å (or A), pm");
    o.z_unit.clear();
    o.current_unit = "nV";
    EXPECT_EQ(message_of(o, 2), "current_unit: unknown unit 'nV'; expected a current in A, mA, uA, nA, pA, fA");
    o.current_unit.clear();
    o.xy_unit = "nm";
    EXPECT_EQ(message_of(o, 2), "xy_unit: a curve has no x and y columns; expected no x, y unit");
    EXPECT_EQ(message_of(o, 4), "(no error)");
    o.xy_unit.clear();
    o.bias_V = 0.0;
    EXPECT_EQ(message_of(o, 2), "bias_V: 0 V is out of range; expected a bias with 0 < |bias| <= 100 V");
    o.bias_V = -150.0;
    EXPECT_EQ(message_of(o, 2), "bias_V: -150 V is out of range; expected a bias with 0 < |bias| <= 100 V");
    o.bias_V = -0.5;
    EXPECT_EQ(message_of(o, 2), "(no error)");
    o.temperature_K = -1.0;
    EXPECT_EQ(message_of(o, 2), "temperature_K: -1 K is out of range; expected a temperature in [0, 2000] K");
}

TEST(reader_options, settings_list_what_differs_from_the_defaults_in_field_order) {
    reader_options o;
    o.delimiter = delimiter_choice::tab;
    o.columns = {"Z", "I"};
    o.z_unit = "nm";
    o.flip_z = true;
    o.bias_V = 0.1;
    o.temperature_K = 4.2;
    const std::vector<std::pair<std::string, std::string>> expected = {
        {"delimiter", "tab"}, {"columns", "Z,I"}, {"z_unit", "nm"}, {"flip_z", ""}, {"bias_V", "0.1V"}, {"temperature_K", "4.2K"}};
    EXPECT_EQ(settings(o), expected);
}

TEST(reader_options, delimiter_names_round_trip) {
    for (delimiter_choice d : {delimiter_choice::detect, delimiter_choice::comma, delimiter_choice::tab,
                               delimiter_choice::semicolon, delimiter_choice::space}) {
        delimiter_choice back = delimiter_choice::detect;
        ASSERT_TRUE(from_string(to_string(d), back)) << to_string(d);
        EXPECT_EQ(back, d);
    }
    delimiter_choice d;
    EXPECT_TRUE(from_string("TAB", d));
    EXPECT_EQ(d, delimiter_choice::tab);
    EXPECT_FALSE(from_string("pipe", d));
}

TEST(reader_options, loaded_from_yaml) {
    const reader_options o = load_reader_options(yaml_file(
        "ok.yaml", "# how to read it\ndelimiter: tab\ncolumns: [Z, I]\nflip_z: true\nbias: 100 mV\ntemperature: 4.2 K\n"));
    EXPECT_EQ(o.delimiter, delimiter_choice::tab);
    EXPECT_EQ(o.columns, (std::vector<std::string>{"Z", "I"}));
    EXPECT_TRUE(o.flip_z);
    EXPECT_DOUBLE_EQ(*o.bias_V, 0.1);  // 100 * 1e-3: one rounding
    EXPECT_EQ(*o.temperature_K, 4.2);
    const std::string bad = yaml_file("bad.yaml", "delimiter: tab\ncolour: red\n");
    try {
        load_reader_options(bad);
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), bad + ":2:9: colour: unknown key; expected one of: delimiter, columns, z_unit, "
                                               "current_unit, xy_unit, flip_z, bias, temperature");
    }
    const std::string flip = yaml_file("flip.yaml", "flip_z: yes please\n");
    try {
        load_reader_options(flip);
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), flip + ":1:9: flip_z: 'yes please' is not true or false");
    }
}
