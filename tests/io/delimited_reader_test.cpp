// The curve reader on the layouts users bring (issue 10): tab, semicolon and whitespace
// delimiters, decimal commas, units in [], () and after /, Å and fA, a byte-order mark, CRLF,
// comments anywhere, trailing delimiters, columns chosen by name or index, header-less files.
// Values are asserted exactly: a cell is read by std::from_chars and multiplied by the unit's SI
// factor, so the expected value is the same product written out (e.g. 0.25 * 1e-9).
#include <gtest/gtest.h>

#include <string>
#include <string_view>
#include <vector>

#include "tipgap/core/error.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/io/reader_options.hpp"

using namespace tipgap;

namespace {

// The SI factors of the units as parse_quantity gives them (exact decimal constants).
constexpr double nm = 1e-9, pm = 1e-12, angstrom = 1e-10, um = 1e-6;
constexpr double pA = 1e-12, nA = 1e-9, fA = 1e-15;

measured_curve read(std::string_view text, const reader_options& o = {}) { return parse_curve_csv(text, "c.txt", o); }

std::string message_of(std::string_view text, const reader_options& o = {}) {
    try {
        read(text, o);
    } catch (const error& e) {
        EXPECT_EQ(e.kind(), error_kind::input);
        return e.what();
    }
    return "(no error)";
}

reader_options with_columns(std::vector<std::string> columns) {
    reader_options o;
    o.columns = std::move(columns);
    return o;
}

reader_options with_units(std::string z_unit, std::string current_unit) {
    reader_options o;
    o.z_unit = std::move(z_unit);
    o.current_unit = std::move(current_unit);
    return o;
}

// The three rows every layout below holds: z 0.25, 0.5, 0.75 and current 40, 8, 1.5 (file units).
void expect_rows(const measured_curve& c, double z_unit, double current_unit) {
    ASSERT_EQ(c.z_m.size(), 3u);
    EXPECT_EQ(c.z_m[0], 0.25 * z_unit);
    EXPECT_EQ(c.z_m[1], 0.5 * z_unit);
    EXPECT_EQ(c.z_m[2], 0.75 * z_unit);
    EXPECT_EQ(c.current_A[0], 40 * current_unit);
    EXPECT_EQ(c.current_A[1], 8 * current_unit);
    EXPECT_EQ(c.current_A[2], 1.5 * current_unit);
}

}  // namespace

TEST(delimited_reader, tab_separated_with_units_in_parentheses) {
    expect_rows(read("z (nm)\tcurrent (pA)\n0.25\t40\n0.5\t8\n0.75\t1.5\n"), nm, pA);
}

TEST(delimited_reader, semicolon_separated_with_decimal_commas) {
    expect_rows(read("z [nm];current [pA]\n0,25;40\n0,5;8\n0,75;1,5\n"), nm, pA);
}

TEST(delimited_reader, runs_of_whitespace_with_units_written_apart) {
    expect_rows(read("  z [nm]    current  ( pA )\n 0.25   40\n0.5\t\t8\n   0.75 1.5   \n"), nm, pA);
    // Decimal commas in a whitespace-separated file.
    expect_rows(read("z/nm current/pA\n0,25 40\n0,5 8\n0,75 1,5\n"), nm, pA);
}

TEST(delimited_reader, units_after_a_slash_and_every_prefix) {
    expect_rows(read("z/Å,I/fA\n0.25,40\n0.5,8\n0.75,1.5\n"), angstrom, fA);
    expect_rows(read("z/A,current/nA\n0.25,40\n0.5,8\n0.75,1.5\n"), angstrom, nA);
    expect_rows(read("Z (pm),I (µA)\n0.25,40\n0.5,8\n0.75,1.5\n"), pm, 1e-6);
    expect_rows(read("z (um),current (uA)\n0.25,40\n0.5,8\n0.75,1.5\n"), um, 1e-6);
    expect_rows(read("z (µm),current (mA)\n0.25,40\n0.5,8\n0.75,1.5\n"), um, 1e-3);
    expect_rows(read("z (m),current (A)\n0.25,40\n0.5,8\n0.75,1.5\n"), 1.0, 1.0);
}

TEST(delimited_reader, byte_order_mark_crlf_blank_and_comment_lines_anywhere) {
    const measured_curve c = read("\xEF\xBB\xBF# bias: 0.1 V\r\n\r\nz [nm],current [pA]\r\n# a note between rows\r\n0.25,40\r\n"
                                  "\r\n0.5,8\r\n   # indented comment\r\n0.75,1.5\r\n# trailing comment\r\n");
    expect_rows(c, nm, pA);
    EXPECT_EQ(*c.metadata.bias_V, 0.1);
}

TEST(delimited_reader, trailing_delimiters_are_empty_cells_after_the_last_column) {
    expect_rows(read("z [nm],current [pA],\n0.25,40,\n0.5,8,,\n0.75,1.5\n"), nm, pA);
    expect_rows(read("z (nm)\tcurrent (pA)\t\n0.25\t40\t\n0.5\t8\t\t\n0.75\t1.5\t\n"), nm, pA);
    expect_rows(read("z [nm];current [pA];\n0,25;40;\n0,5;8;\n0,75;1,5;\n"), nm, pA);
}

TEST(delimited_reader, current_column_named_I_and_extra_columns_ignored) {
    const measured_curve c = read("time (s)\tZ (nm)\tI (pA)\tAux (V)\n0,1\t0,25\t40\t0,5\n0,2\t0,5\t8\t0,5\n"
                                  "0,3\t0,75\t1,5\t0,5\n");
    expect_rows(c, nm, pA);
}

TEST(delimited_reader, columns_by_name_case_insensitive_without_unit) {
    const std::string text = "t [s],height [nm],I_raw [nA],I_filtered [pA]\n0,0.25,9,40\n1,0.5,9,8\n2,0.75,9,1.5\n";
    expect_rows(read(text, with_columns({"HEIGHT", "i_filtered"})), nm, pA);
    // A spec may carry a unit: it is compared without it.
    expect_rows(read(text, with_columns({"height [m]", "I_filtered (A)"})), nm, pA);
}

TEST(delimited_reader, columns_by_one_based_index) {
    const std::string text = "t [s],height [nm],I_raw [nA],I_filtered [pA]\n0,0.25,9,40\n1,0.5,9,8\n2,0.75,9,1.5\n";
    expect_rows(read(text, with_columns({"2", "4"})), nm, pA);
    // Mixed: an index and a name.
    expect_rows(read(text, with_columns({"2", "I_filtered"})), nm, pA);
}

TEST(delimited_reader, headerless_file_with_columns_by_index_and_units) {
    reader_options o = with_columns({"2", "1"});
    o.z_unit = "nm";
    o.current_unit = "pA";
    const measured_curve c = read("# no header in this export\n40\t0,25\n8\t0,5\n1,5\t0,75\n", o);
    expect_rows(c, nm, pA);
    // Comma separated, with a trailing delimiter, and a CRLF.
    o.columns = {"1", "2"};
    expect_rows(read("0.25,40,\r\n0.5,8,\r\n0.75,1.5,\r\n", o), nm, pA);
    // Whitespace separated with decimal commas ("0,25 40" is two cells, not three).
    expect_rows(read("0,25 40\n0,5 8\n0,75 1,5\n", o), nm, pA);
}

TEST(delimited_reader, given_units_for_a_header_without_units) {
    const reader_options o = with_units("Å", "fA");
    const measured_curve c = read("z,current\n0.25,40\n0.5,8\n0.75,1.5\n", o);
    expect_rows(c, angstrom, fA);
    EXPECT_TRUE(c.notes.empty());
}

TEST(delimited_reader, given_unit_that_differs_from_the_header_wins_with_a_note) {
    reader_options o;
    o.z_unit = "nm";
    const measured_curve c = read("z (m),current (pA)\n0.25,40\n0.5,8\n0.75,1.5\n", o);
    expect_rows(c, nm, pA);
    ASSERT_EQ(c.notes.size(), 1u);
    EXPECT_EQ(c.notes[0], "column 'z': the header gives the unit 'm'; the given unit 'nm' is used instead");
    // The same unit spelled otherwise (Å and A) is no difference.
    o.z_unit = "A";
    EXPECT_TRUE(read("z (Å),current (pA)\n0.25,40\n0.5,8\n0.75,1.5\n", o).notes.empty());
}

TEST(delimited_reader, forced_delimiter) {
    reader_options o;
    o.delimiter = delimiter_choice::semicolon;
    // Detected, the tab in the header would win; forced, the semicolon splits and the tab is padding.
    expect_rows(read("z [nm]\t;current [pA]\n0,25\t;40\n0,5;8\n0,75;1,5\n", o), nm, pA);
    o.delimiter = delimiter_choice::space;
    expect_rows(read("z[nm] current[pA]\n0.25 40\n0.5 8\n0.75 1.5\n", o), nm, pA);
}

TEST(delimited_reader, bias_and_temperature_given_and_overridden_with_notes) {
    reader_options o;
    o.bias_V = 0.2;
    o.temperature_K = 77.0;
    const measured_curve without = read("z [nm],current [pA]\n0.25,40\n0.5,8\n0.75,1.5\n", o);
    EXPECT_EQ(*without.metadata.bias_V, 0.2);
    EXPECT_EQ(*without.metadata.temperature_K, 77.0);
    EXPECT_TRUE(without.notes.empty());
    const measured_curve stated =
        read("# bias: 100 mV\n# temperature: 77 K\nz [nm],current [pA]\n0.25,40\n0.5,8\n0.75,1.5\n", o);
    EXPECT_EQ(*stated.metadata.bias_V, 0.2);
    ASSERT_EQ(stated.notes.size(), 1u);  // the same temperature: no note
    EXPECT_EQ(stated.notes[0], "the file states bias 100 mV; the given 0.2 V is used instead");
}

TEST(delimited_reader, flip_z_reads_z_as_minus_z) {
    reader_options o;
    o.flip_z = true;
    const measured_curve c = read("z [nm],current [pA]\n0.75,40\n0.5,8\n0.25,1.5\n", o);
    EXPECT_EQ(c.z_m[0], -0.75 * nm);
    EXPECT_EQ(c.z_m[2], -0.25 * nm);
    ASSERT_EQ(c.sweeps.size(), 1u);
    EXPECT_EQ(c.sweeps[0].direction, sweep_direction::retract);
}

// Every new mistake, with its exact message (file:line:column: what; what was expected).
TEST(delimited_reader, layout_errors_give_exact_messages) {
    const std::string four = "t [s],height [nm],I_raw [nA],I_filtered [pA]\n0,0.25,9,40\n1,0.5,9,8\n2,0.75,9,1.5\n";
    EXPECT_EQ(message_of(four, with_columns({"Z", "I_raw"})),
              "c.txt:1:1: no column named 'Z' (chosen for z); the header has 't', 'height', 'I_raw', 'I_filtered'");
    EXPECT_EQ(message_of(four, with_columns({"2", "5"})),
              "c.txt:1:1: column 5 (chosen for current) is beyond the 4 columns of the header");
    EXPECT_EQ(message_of(four, with_columns({"height", "2"})), "c.txt:1:1: column 'height' is chosen for both z and current");
    EXPECT_EQ(message_of("z [nm],current [pA]\n0.25,40\n0.5,8,7\n"),
              "c.txt:3:1: the row has 3 cells; the header on line 1 has 2 columns");
    EXPECT_EQ(message_of("z (nm)\tcurrent (pA)\n0,25\t40\n0,5\t8\t7\t\n"),
              "c.txt:3:1: the row has 3 cells; the header on line 1 has 2 columns");
    EXPECT_EQ(message_of("z (nm)\tcurrent (pA)\n0,25\t40\n0,5\t8,1,2\n"),
              "c.txt:3:5: '8,1,2' in column 'current' is not a number; expected a plain number such as 0.25 (the unit "
              "goes in the header)");
    EXPECT_EQ(message_of("z (nm)\tcurrent (pA)\n0.25\t40\n0,5\t1.234,5\n"),
              "c.txt:3:5: '1.234,5' in column 'current' is not a number; expected a plain number such as 0.25 (the unit "
              "goes in the header)");
    EXPECT_EQ(message_of("z [nm] current [pA]\n0.25 40\n0.5\n"),
              "c.txt:3:1: the row has 1 cell; the header on line 1 has 2 columns");
    EXPECT_EQ(message_of("z (furlong)\tcurrent (pA)\n"),
              "c.txt:1:1: unknown unit 'furlong' in 'z (furlong)'; expected a length in m, cm, mm, um, nm, Å (or A), pm");
    EXPECT_EQ(message_of("z/nm;I\n"), "c.txt:1:6: column 'I' has no unit; write it in brackets, e.g. 'current [nA]'");
    // A column chosen by index may have any name: it is quoted and clipped like any input (found by
    // fuzz_curve_csv: tests/fuzz/seeds/curve_csv/regression_column_name_by_index.csv).
    EXPECT_EQ(message_of("a\x01" + std::string(100, 'b') + ",I (pA)\n", with_columns({"1", "2"})),
              "c.txt:1:1: column 'a\\x01bbbbbbbbbbbbbbbbbbbbbbbbbbbb...' has no unit; write it in brackets, e.g. 'z [nm]'");
    reader_options headerless = with_columns({"1", "2"});
    headerless.z_unit = "nm";
    headerless.current_unit = "pA";
    EXPECT_EQ(message_of("0.25,40\n0.5\n", headerless), "c.txt:2:1: the row has 1 cell; the first row (line 1) has 2 columns");
    headerless.columns = {"1", "3"};
    EXPECT_EQ(message_of("0.25,40\n0.5,8\n", headerless),
              "c.txt:1:1: column 3 (chosen for current) is beyond the 2 cells of the first row (the file has no header)");
    // Without units (or by name), a first row of numbers is no header.
    EXPECT_EQ(message_of("0.25,40\n0.5,8\n", with_columns({"1", "2"})),
              "c.txt:1:1: no header row: the first row holds numbers; expected a header such as 'z [nm],current [nA]' "
              "before the data (or, for a file without a header, the columns by index with their units: --columns 1,2 "
              "--z-unit nm --current-unit pA)");
}
