// Tests for the I(z) curve reader: units, metadata, sweep splitting and every malformed-file
// message, checked word for word.
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>

#include "tipgap/io/curve_io.hpp"
#include "tipgap/core/error.hpp"

using namespace tipgap;

namespace {

// Unit conversions are one multiplication by an exact decimal factor: a few ulp.
constexpr double kConversion = 1e-15;

std::string message_of(std::string_view text) {
    try {
        parse_curve_csv(text, "c.csv");
    } catch (const error& e) {
        EXPECT_EQ(e.kind(), error_kind::input);
        return e.what();
    }
    return "(no error)";
}

}  // namespace

TEST(curve_io, metadata_units_and_si_conversion) {
    const auto c = parse_curve_csv(
        "# bias: -100 mV\n"
        "# temperature: 4.2 K\n"
        "# setpoint_current: 1 nA\n"
        "# sample: Au(111), sputtered\n"
        "# tip: W, etched\n"
        "# x: 12.5 nm\n"
        "# y: -3 Å\n"
        "# operator note without a colon is a comment\n"
        "z [nm], current [nA]\r\n"
        "0.00, -1.5\r\n"
        "0.10, -0.25\r\n"
        "+0.20, -4.0e-2\r\n",
        "c.csv");
    ASSERT_EQ(c.z_m.size(), 3u);
    EXPECT_NEAR(c.z_m[1], 0.1e-9, 0.1e-9 * kConversion);
    EXPECT_NEAR(c.z_m[2], 0.2e-9, 0.2e-9 * kConversion);
    EXPECT_NEAR(c.current_A[0], -1.5e-9, 1.5e-9 * kConversion);
    EXPECT_NEAR(c.current_A[2], -4.0e-11, 4.0e-11 * kConversion);
    ASSERT_TRUE(c.metadata.bias_V.has_value());
    EXPECT_NEAR(*c.metadata.bias_V, -0.1, 0.1 * kConversion);
    EXPECT_NEAR(*c.metadata.temperature_K, 4.2, 4.2 * kConversion);
    EXPECT_NEAR(*c.metadata.setpoint_current_A, 1e-9, 1e-9 * kConversion);
    EXPECT_NEAR(*c.metadata.x_m, 12.5e-9, 12.5e-9 * kConversion);
    EXPECT_NEAR(*c.metadata.y_m, -3e-10, 3e-10 * kConversion);
    EXPECT_EQ(c.metadata.sample, "Au(111), sputtered");
    EXPECT_EQ(c.metadata.tip, "W, etched");
    ASSERT_NE(c.metadata.find("bias"), nullptr);
    EXPECT_EQ(*c.metadata.find("bias"), "-100 mV");
    EXPECT_EQ(c.metadata.entries.size(), 7u);
    ASSERT_EQ(c.sweeps.size(), 1u);
    EXPECT_EQ(c.sweeps[0].direction, sweep_direction::retract);
}

TEST(curve_io, every_length_and_current_unit) {
    struct case_t {
        const char* header;
        double z_factor, i_factor;
    };
    const case_t cases[] = {{"z [Å],current [pA]", 1e-10, 1e-12}, {"z [A],current [fA]", 1e-10, 1e-15},
                            {"z [pm],current [uA]", 1e-12, 1e-6}, {"z [m],current [A]", 1.0, 1.0},
                            {"Z [nm],Current [nA]", 1e-9, 1e-9}};
    for (const auto& k : cases) {
        const auto c = parse_curve_csv(std::string(k.header) + "\n1,2\n2,3\n3,4\n", "c.csv");
        EXPECT_NEAR(c.z_m[2], 3 * k.z_factor, 3 * k.z_factor * kConversion) << k.header;
        EXPECT_NEAR(c.current_A[2], 4 * k.i_factor, 4 * k.i_factor * kConversion) << k.header;
    }
}

TEST(curve_io, extra_columns_are_ignored_and_columns_may_come_in_any_order) {
    const auto c = parse_curve_csv("current [pA],bias [V],z [nm]\n10,0.1,0.3\n5,0.1,0.4\n2,0.1,0.5\n", "c.csv");
    EXPECT_NEAR(c.z_m[0], 0.3e-9, 0.3e-9 * kConversion);
    EXPECT_NEAR(c.current_A[2], 2e-12, 2e-12 * kConversion);
}

TEST(curve_io, direction_column_splits_into_runs) {
    const auto c = parse_curve_csv(
        "z [nm],current [nA],direction\n"
        "0.3,0.1,approach\n0.2,0.3,approach\n0.1,1.0,approach\n"
        "0.1,1.0,retract\n0.2,0.3,Retract\n0.3,0.1,retract\n0.4,0.03,retract\n",
        "c.csv");
    EXPECT_TRUE(c.has_direction_column);
    ASSERT_EQ(c.sweeps.size(), 2u);
    EXPECT_EQ(c.sweeps[0].direction, sweep_direction::approach);
    EXPECT_EQ(c.sweeps[0].z_m.size(), 3u);
    EXPECT_EQ(c.sweeps[1].direction, sweep_direction::retract);
    EXPECT_EQ(c.sweeps[1].z_m.size(), 4u);
    EXPECT_EQ(c.sweeps[1].first_row, 3u);
}

TEST(curve_io, split_where_z_turns_back_ignoring_jitter) {
    // Approach 0.5 -> 0 nm, retract 0 -> 0.5 nm, with a 0.004 nm backwards jitter (below 5 % of
    // the range) inside the approach that must not split it.
    std::vector<double> z, i;
    for (int k = 0; k <= 50; ++k) z.push_back((0.5 - 0.01 * k) * 1e-9);
    z[20] += 0.014e-9;  // 0.004 nm above its predecessor
    for (int k = 1; k <= 50; ++k) z.push_back(0.01 * k * 1e-9);
    for (double v : z) i.push_back(std::exp(-2e10 * v));
    const auto sweeps = split_at_turns(z, i);
    ASSERT_EQ(sweeps.size(), 2u);
    EXPECT_EQ(sweeps[0].direction, sweep_direction::approach);
    EXPECT_EQ(sweeps[0].z_m.size(), 51u);  // ends at the turning point z = 0
    EXPECT_EQ(sweeps[1].direction, sweep_direction::retract);
    EXPECT_EQ(sweeps[1].z_m.size(), 50u);
    EXPECT_EQ(sweeps[1].first_row, 51u);
}

TEST(curve_io, read_from_disk_and_missing_file) {
    const auto dir = std::filesystem::temp_directory_path() / "tipgap_curve_io_test";
    std::filesystem::create_directories(dir);
    const std::string path = (dir / "one.csv").string();
    {
        std::ofstream out(path);
        out << "z [nm],current [nA]\n0,1\n0.1,0.5\n0.2,0.25\n";
    }
    const auto c = read_curve_csv(path);
    EXPECT_EQ(c.file, path);
    EXPECT_EQ(c.z_m.size(), 3u);
    const std::string missing = (dir / "absent.csv").string();
    try {
        read_curve_csv(missing);
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), missing + ": cannot open the file for reading: No such file or directory");
    }
}

// Every malformed-file class, with its exact message (file:line:column: what; what was expected).
TEST(curve_io, malformed_files_give_exact_messages) {
    EXPECT_EQ(message_of(""),
              "c.csv: the file is empty; expected a header row such as 'z [nm],current [nA]' followed by data rows");
    EXPECT_EQ(message_of("  \n\n"),
              "c.csv: the file is empty; expected a header row such as 'z [nm],current [nA]' followed by data rows");
    EXPECT_EQ(message_of("# bias: 1 V\n# only metadata\n"),
              "c.csv: no header row: the file holds only '#' lines; expected a header such as 'z [nm],current [nA]' "
              "followed by data rows");
    EXPECT_EQ(message_of("# bias: 1 V\n0.1,2\n0.2,1\n"),
              "c.csv:2:1: no header row: the first row holds numbers; expected a header such as 'z [nm],current "
              "[nA]' before the data (or, for a file without a header, the columns by index with their units: "
              "--columns 1,2 --z-unit nm --current-unit pA)");
    EXPECT_EQ(message_of("z [nm],current [nV]\n"),
              "c.csv:1:8: unknown unit 'nV' in 'current [nV]'; expected a current in A, mA, uA, nA, pA, fA");
    EXPECT_EQ(message_of("z [furlong],current [nA]\n"),
              "c.csv:1:1: unknown unit 'furlong' in 'z [furlong]'; expected a length in m, cm, mm, um, nm, Å (or A), "
              "pm");
    EXPECT_EQ(message_of("z,current [nA]\n"), "c.csv:1:1: column 'z' has no unit; write it in brackets, e.g. 'z [nm]'");
    EXPECT_EQ(message_of("z [nm],signal [nA]\n0,1\n"),
              "c.csv:1:1: the header has no 'current [<current unit>]' column; expected a header such as 'z "
              "[nm],current [nA]'");
    EXPECT_EQ(message_of("z [nm],current [nA]\n0.1,1\n0.2, abc\n"), "c.csv:3:6: 'abc' in column 'current' is not a number; expected a plain number such as 0.25 (the unit goes "
              "in the header)");
    EXPECT_EQ(message_of("z [nm],current [nA]\n0.1,1\n0.2,\n"), "c.csv:3:5: empty cell in column 'current'; expected a number");
    EXPECT_EQ(message_of("z [nm],current [nA]\nnan,1\n"), "c.csv:2:1: 'nan' in column 'z' is not a finite number; expected a finite value");
    EXPECT_EQ(message_of("z [nm],current [nA]\n0.1,-inf\n"), "c.csv:2:5: '-inf' in column 'current' is not a finite number; expected a finite value");
    EXPECT_EQ(message_of("z [nm],current [nA]\n0.1,1e999\n"),
              "c.csv:2:5: '1e999' in column 'current' is outside the range of a double; expected a magnitude of 0 or "
              "between about 1e-308 and 1e308");
    EXPECT_EQ(message_of("z [nm],current [nA]\n0.1,1\n0.2,0.5,7\n"),
              "c.csv:3:1: the row has 3 cells; the header on line 1 has 2 columns");
    EXPECT_EQ(message_of("z [nm],current [nA]\n0.1\n"), "c.csv:2:1: the row has 1 cell; the header on line 1 has 2 columns");
    EXPECT_EQ(message_of("z [nm],current [nA]\n0.1,1\n0.2,0.5\n"), "c.csv: only 2 data rows; a curve needs at least 3 points");
    EXPECT_EQ(message_of("z [nm],current [nA],direction\n0.1,1,up\n"),
              "c.csv:2:7: 'up' in column 'direction' is not a sweep direction; expected approach or retract");
    EXPECT_EQ(message_of("# bias: 1 furlong\nz [nm],current [nA]\n"),
              "c.csv:1:9: bias: unknown unit 'furlong' in '1 furlong'; expected a voltage in V, mV, uV, kV");
    EXPECT_EQ(message_of("z [nm],z [pm],current [nA]\n"), "c.csv:1:8: column 'z' appears twice in the header");
}
