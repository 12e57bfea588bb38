// Declared output columns (tipgap/io/columns.hpp): the exact table, CSV and JSON text the one
// formatter writes for a small declared result. The expected texts are this project's output
// contract (the formats `tipgap` has always printed: rounded tables with a dashed rule, CSV with 17
// significant digits, JSON with two-space indent), not values from an outside source.
#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include "tipgap/io/columns.hpp"

using namespace tipgap;

namespace {

struct sample_row {
    std::string name;
    double gap_m = 0;
    double current_A = 0;
    double current_stddev_A = std::numeric_limits<double>::quiet_NaN();
    int points = 0;
    bool ok = false;
    std::vector<std::string> warnings;
};

std::vector<column<sample_row>> sample_columns() {
    using r = sample_row;
    std::vector<column<r>> out = {
        {"name", "name", [](const r& x) { return x.name; }},
        {"gap_nm", "gap [nm]", [](const r& x) { return x.gap_m; }, times(1e9)},
        {.key = "current_A", .label = "I [A]", .get = [](const r& x) { return x.current_A; },
         .spread = [](const r& x) { return x.current_stddev_A; }},
        {"points", "points", [](const r& x) { return x.points; }},
        {"ok", "ok", [](const r& x) { return x.ok; }},
        {"warnings", "", [](const r& x) { return x.warnings; }, {}, {}, in_data},
    };
    return out;
}

// 0.6e-9 m times 1e9 is 0.59999999999999998 in binary floating point (Python: "%.17g" % (0.6e-9 * 1e9)):
// 17 digits in CSV, the shortest text that reads back (0.6) in JSON, 4 significant digits in the table.
const std::vector<sample_row> rows = {
    {"a,b", 0.6e-9, 1.234567e-9, 2e-11, 12, true, {}},
    {"c", std::numeric_limits<double>::quiet_NaN(), -2.5e-12, std::numeric_limits<double>::quiet_NaN(), 3, false,
     {"near contact", "x"}},
};

}  // namespace

TEST(columns, table_is_aligned_with_units_rule_and_plus_minus) {
    EXPECT_EQ(format_table(sample_columns(), rows),
              "name  gap [nm]                I [A]  points   ok\n"
              "------------------------------------------------\n"
              " a,b    0.6000  1.235e-09 ± 2.0e-11      12  yes\n"
              "   c       NaN           -2.500e-12       3   no\n");
}

TEST(columns, csv_has_keys_full_precision_and_quoting) {
    EXPECT_EQ(format_csv(sample_columns(), rows),
              "name,gap_nm,current_A,points,ok,warnings\n"
              "\"a,b\",0.59999999999999998,1.2345670000000001e-09,12,yes,\n"
              "c,nan,-2.4999999999999998e-12,3,no,near contact; x\n");
}

TEST(columns, json_has_the_same_keys_and_values) {
    EXPECT_EQ(json_text(to_records(sample_columns(), rows)),
              "[\n"
              "  {\n"
              "    \"name\": \"a,b\",\n"
              "    \"gap_nm\": 0.6,\n"
              "    \"current_A\": 1.234567e-09,\n"
              "    \"points\": 12,\n"
              "    \"ok\": true,\n"
              "    \"warnings\": []\n"
              "  },\n"
              "  {\n"
              "    \"name\": \"c\",\n"
              "    \"gap_nm\": null,\n"
              "    \"current_A\": -2.5e-12,\n"
              "    \"points\": 3,\n"
              "    \"ok\": false,\n"
              "    \"warnings\": [\n"
              "      \"near contact\",\n"
              "      \"x\"\n"
              "    ]\n"
              "  }\n"
              "]\n");
}

TEST(columns, absent_values_leave_json_keys_out_and_cells_empty) {
    using r = sample_row;
    std::vector<column<r>> cols = {
        {"name", "name", [](const r& x) { return x.name; }},
        {.key = "stddev_A", .label = "u [A]",
         .get = [](const r& x) { return std::isnan(x.current_stddev_A) ? cell(absent{}) : cell(x.current_stddev_A); },
         .none = "-"},
        // An empty key merges a record into the row (how the uncertainty keys join a point).
        {.key = "", .get = [](const r& x) { record m; m.set("points_x2", 2 * x.points); return cell(m); }, .shown = in_json},
    };
    EXPECT_EQ(format_csv(cols, rows), "name,stddev_A\n\"a,b\",1.9999999999999999e-11\nc,\n");
    EXPECT_EQ(format_table(cols, rows), "name      u [A]\n---------------\n a,b  2.000e-11\n   c          -\n");
    EXPECT_EQ(json_text(to_record(cols, rows[1])), "{\n  \"name\": \"c\",\n  \"points_x2\": 6\n}\n");
}

TEST(columns, sorted_keys_are_in_byte_order_all_the_way_down) {
    record inner;
    inner.set("b", 1);
    inner.set("a", 2);
    record outer;
    outer.set("z", inner);
    outer.set("Z", "upper case sorts first");
    EXPECT_EQ(json_text(outer, true),
              "{\n  \"Z\": \"upper case sorts first\",\n  \"z\": {\n    \"a\": 2,\n    \"b\": 1\n  }\n}\n");
    // A record marked sorted sorts itself and what it holds inside an ordered document.
    record doc;
    doc.set("second", 2);
    inner.sorted_keys = true;
    doc.set("first", inner);
    EXPECT_EQ(json_text(doc), "{\n  \"second\": 2,\n  \"first\": {\n    \"a\": 2,\n    \"b\": 1\n  }\n}\n");
}

TEST(columns, fixed_widths_pad_left_or_right_and_let_a_long_cell_overflow) {
    using r = sample_row;
    std::vector<column<r>> cols = {
        {.key = "name", .label = "name", .get = [](const r& x) { return x.name; }, .left = true},
        {.key = "points", .label = "n", .get = [](const r& x) { return x.points; }, .width = 3},
        {.key = "gap_nm", .label = "gap", .get = [](const r& x) { return x.gap_m; }, .scale = times(1e9), .number = fixed(3),
         .width = 4},
    };
    EXPECT_EQ(format_table(cols, rows, {.rule = false}),
              "name    n   gap\n"
              "a,b    12  0.600\n"
              "c       3   nan\n");
}

TEST(columns, a_line_of_prose_takes_each_key_from_its_column) {
    EXPECT_EQ(format_line(sample_columns(), rows[0], "{name}: I = {current_A}, {points} points, ok: {ok}"),
              "a,b: I = 1.235e-09 ± 2.0e-11, 12 points, ok: yes");
    EXPECT_THROW(format_line(sample_columns(), rows[0], "{nothing}"), std::logic_error);
}
