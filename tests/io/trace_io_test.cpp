// Reading bias-sweep traces (z(V) and dI/dV(V)) for `tipgap resonances`.
#include <gtest/gtest.h>

#include <string>

#include "tipgap/core/error.hpp"
#include "tipgap/io/trace_io.hpp"

using namespace tipgap;

namespace {
std::string rows(int n) {
    std::string s;
    for (int i = 0; i < n; ++i) s += std::to_string(4.0 + 0.5 * i) + "," + std::to_string(3.0 + 0.1 * i) + "\n";
    return s;
}
std::string message(const std::string& text) {
    try {
        parse_bias_trace(text, "t.csv");
    } catch (const error& e) {
        return e.what();
    }
    return "no error";
}
}  // namespace

TEST(trace_io, reads_zv_trace_with_current_and_units) {
    const auto t = parse_bias_trace("# current: 1 nA\n# temperature: 4.2 K\nbias [mV],z [Å],other\n" +
                                        std::string("4000,32,x\n4500,33,x\n5000,34,x\n5500,35,x\n6000,36,x\n"
                                                    "6500,37,x\n7000,38,x\n7500,39,x\n"),
                                    "t.csv");
    EXPECT_EQ(t.kind, trace_kind::zv);
    ASSERT_TRUE(t.current_A);
    EXPECT_DOUBLE_EQ(*t.current_A, 1e-9);
    ASSERT_EQ(t.bias_V.size(), 8u);
    EXPECT_DOUBLE_EQ(t.bias_V[0], 4.0);
    EXPECT_DOUBLE_EQ(t.signal[7], 3.9e-9);
    EXPECT_DOUBLE_EQ(*t.metadata.temperature_K, 4.2);
}

TEST(trace_io, reads_didv_in_arbitrary_units_sorted_by_bias) {
    std::string text = "# setpoint_current: 100 pA\ndI/dV [a.u.],bias [V]\n";
    for (int i = 7; i >= 0; --i) text += std::to_string(1.0 + i) + "," + std::to_string(5.0 + 0.1 * i) + "\n";
    const auto t = parse_bias_trace(text, "t.csv");
    EXPECT_EQ(t.kind, trace_kind::didv);
    EXPECT_TRUE(t.arbitrary_units);
    EXPECT_DOUBLE_EQ(*t.current_A, 100e-12);
    EXPECT_DOUBLE_EQ(t.bias_V.front(), 5.0);
    EXPECT_DOUBLE_EQ(t.signal.front(), 1.0);
}

TEST(trace_io, error_messages_name_file_line_column) {
    EXPECT_EQ(message("bias [V],current [nA]\n" + rows(8)),
              "t.csv:1:1: the header has no 'z [<length unit>]' or 'didv' column; expected a header such as "
              "'bias [V],z [nm]' or 'bias [V],didv [nS]'");
    EXPECT_EQ(message("bias,z [nm]\n" + rows(8)), "t.csv:1:1: column 'bias' has no unit; write it in brackets, e.g. 'bias [V]'");
    EXPECT_EQ(message("# current: 1 nV\nbias [V],z [nm]\n" + rows(8)),
              "t.csv:1:12: current: unknown unit 'nV' in '1 nV'; expected a current in A, mA, uA, nA, pA, fA");
    EXPECT_EQ(message("bias [V],z [nm]\n" + rows(3)), "t.csv: only 3 data rows; a trace needs at least 8 points");
    EXPECT_EQ(message("bias [V],z [nm]\n4,1\n" + rows(8)), "t.csv: bias: bias 4 V appears twice; expected one row per bias");
    EXPECT_EQ(message("bias [V],z [nm]\n4,x\n" + rows(8)),
              "t.csv:2:3: 'x' in column 'z' is not a finite number; expected a plain number such as 0.25 (the unit "
              "goes in the header)");
}
