// Declared output columns (tipgap/io/columns.hpp): the exact table, CSV and JSON text the one
// formatter writes for a small declared result. The expected texts are this project's output
// contract (the formats `tipgap` has always printed: rounded tables with a dashed rule, CSV with 17
// significant digits, JSON with two-space indent), not values from an outside source.
#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <random>
#include <string>
#include <vector>

#include "tipgap/io/columns.hpp"
#include "tipgap/io/report.hpp"

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
              " a,b    0.6000  (1.235 ± 0.020)e-09      12  yes\n"
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
              "a,b: I = (1.235 ± 0.020)e-09, 12 points, ok: yes");
    EXPECT_THROW(format_line(sample_columns(), rows[0], "{nothing}"), std::logic_error);
}

// Two significant digits of the uncertainty, the value rounded to the same place (common practice
// in reporting measurements, no source); a non-zero uncertainty never prints as zero.
TEST(columns, uncertainty_has_two_digits_and_the_value_matches) {
    EXPECT_EQ(with_uncertainty(4.41234, 0.0123), "4.412 ± 0.012");
    EXPECT_EQ(with_uncertainty(4.41234, 0.000412), "4.41234 ± 0.00041");
    EXPECT_EQ(with_uncertainty(12345.0, 678.0), "12350 ± 680");
    EXPECT_EQ(with_uncertainty(-2.5, 0.996), "-2.5 ± 1.0");
    EXPECT_EQ(with_uncertainty(1.0002e-9, 1.3e-12), "(1.0002 ± 0.0013)e-09");
    EXPECT_EQ(with_uncertainty(4.4, 0.0), "4.400 ± 0");
    EXPECT_EQ(with_uncertainty(10.0, 1.6e-9), "10.0000000000 ± 0.0000000016");  // noise-free data
    EXPECT_EQ(interval_text(4.398, 4.4271), "4.398 – 4.427");
    EXPECT_EQ(interval_text(4.41, 4.41), "4.410 – 4.410");
}

TEST(columns, no_nonzero_uncertainty_prints_as_zero_over_many_seeded_pairs) {
    std::mt19937_64 rng(15);
    std::uniform_real_distribution<double> exponent(-16.0, 8.0), mantissa(-9.99, 9.99), ratio(-9.0, 1.0);
    int checked = 0;
    for (int i = 0; i < 20000; ++i) {
        const double v = mantissa(rng) * std::pow(10.0, exponent(rng));
        const double u = std::abs(v) * std::pow(10.0, ratio(rng)) + 1e-300;
        const std::string s = with_uncertainty(v, u);
        // The uncertainty's digits: between "± " and the end or ")".
        const std::size_t pm = s.find("± ");
        ASSERT_NE(pm, std::string::npos) << s;
        std::string digits = s.substr(pm + 3);
        const std::size_t close = digits.find(')');
        double scale = 1.0;
        if (close != std::string::npos) {
            scale = std::pow(10.0, std::stoi(digits.substr(close + 2)));
            digits = digits.substr(0, close);
        }
        const double shown = std::stod(digits) * scale;
        ASSERT_GT(shown, 0.0) << v << " ± " << u << " -> " << s;
        // Two significant digits: within 5 % of the uncertainty (rounding 1.05 to 1.1 is 4.8 %).
        ASSERT_NEAR(shown / u, 1.0, 0.05) << v << " ± " << u << " -> " << s;
        // The value's text has the same number of decimals as the uncertainty's.
        const std::string value = s.substr(s.front() == '(' ? 1 : 0, pm - 1 - (s.front() == '(' ? 1 : 0));
        const auto decimals = [](const std::string& t) {
            const std::size_t dot = t.find('.');
            return dot == std::string::npos ? std::size_t{0} : t.size() - dot - 1;
        };
        ASSERT_EQ(decimals(value), decimals(digits)) << s;
        ++checked;
    }
    EXPECT_EQ(checked, 20000);
}

TEST(columns, reading_prefix_keeps_values_between_one_and_a_thousand) {
    EXPECT_EQ(reading_prefix(1e-10), (std::pair<double, std::string>{1e-12, "p"}));
    EXPECT_EQ(reading_prefix(1e-9), (std::pair<double, std::string>{1e-9, "n"}));
    EXPECT_EQ(reading_prefix(3.0), (std::pair<double, std::string>{1.0, ""}));
    EXPECT_EQ(reading_prefix(0.1), (std::pair<double, std::string>{1e-3, "m"}));
    EXPECT_EQ(reading_prefix(2e9), (std::pair<double, std::string>{1e9, "G"}));
    EXPECT_EQ(reading_prefix(8e-16), (std::pair<double, std::string>{1e-15, "f"}));
    EXPECT_EQ(reading_prefix(8e-16, 1e-12), (std::pair<double, std::string>{1e-12, "p"}));  // lengths: 0.0008 pm
    EXPECT_EQ(reading_prefix(0.0), (std::pair<double, std::string>{1.0, ""}));
}

TEST(columns, a_narrow_interval_keeps_its_ends_apart) {
    EXPECT_EQ(interval_text(4.4439995, 4.4440005), "4.44399950 – 4.44400050");
    EXPECT_EQ(interval_text(-1.25, 2.5), "-1.2 – 2.5");
    EXPECT_EQ(interval_text(120.0, 180.0), "120 – 180");
}

// A length column whose values are all zero (the Δz of a one-point z(V) plan) reads in nm, not m;
// other quantities keep their base unit.
TEST(columns, an_all_zero_length_column_reads_in_nanometres) {
    using r = sample_row;
    const std::vector<column<r>> cols = {
        {.key = "dz_nm", .label = "dz", .get = [](const r& x) { return x.gap_m; }, .scale = times(1e9), .reading_unit = "m"},
        {.key = "current_A", .label = "I", .get = [](const r& x) { return x.current_A; }, .reading_unit = "A"},
    };
    r row;
    row.name = "a";
    const std::vector<r> zero = {row};
    EXPECT_EQ(format_table(cols, zero, {.rule = false}), "dz [nm]  I [A]\n      0      0\n");
}

TEST(columns, render_picks_the_format_and_frames_only_the_table_and_the_json) {
    report_frame frame{.rows_key = "rows", .before_table = "# above\n", .after_table = "below\n"};
    frame.json.set("command", "test");
    EXPECT_EQ(render(output_format::csv, sample_columns(), rows, frame), format_csv(sample_columns(), rows));
    EXPECT_EQ(render(output_format::table, sample_columns(), rows, frame),
              "# above\n" + format_table(sample_columns(), rows) + "below\n");
    record doc;
    doc.set("command", "test");
    doc.set("rows", to_records(sample_columns(), rows));
    EXPECT_EQ(render(output_format::json, sample_columns(), rows, frame), json_text(doc));
    output_format f = output_format::table;
    EXPECT_TRUE(from_string("json", f));
    EXPECT_EQ(f, output_format::json);
    EXPECT_FALSE(from_string("xml", f));
    EXPECT_EQ(accepted_names<output_format>(), "table, csv or json");
}
