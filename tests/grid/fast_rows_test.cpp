// The fast path of the grid CSV parser (grid/detail/fast_rows.hpp): it takes plain rows only,
// and a grid read with it gives bit for bit the values and the messages of the general parser,
// on files that mix plain rows with everything the fast path must leave to the general one.
#include <gtest/gtest.h>

#include <cmath>
#include <cstring>
#include <fmt/format.h>
#include <map>
#include <mutex>
#include <random>
#include <string>
#include <utility>
#include <vector>

#include "grid/detail/fast_rows.hpp"
#include "support/temp_dir.hpp"
#include "tipgap/grid/grid.hpp"

namespace {

using namespace tipgap;
using namespace tipgap_test;

const char* scan(const std::string& text, detail::plain_row& row, std::string_view px = {}, std::string_view py = {}) {
    return detail::scan_plain_row(text.data(), text.data() + text.size(), px, py, row);
}

TEST(fast_rows, takes_plain_rows_and_leaves_everything_else) {
    detail::plain_row r;
    const std::string plain = "12,-3.5,0.0125,194951\nnext";
    ASSERT_EQ(scan(plain, r), plain.data() + plain.find('n'));
    EXPECT_EQ(r.x_text, "12");
    EXPECT_EQ(r.y_text, "-3.5");
    EXPECT_EQ(r.z, 0.0125);
    EXPECT_EQ(r.current, 194951.0);
    // The previous row's x and y texts are reused when the row repeats them.
    const std::string prev_x = "12", prev_y = "-3.5";
    ASSERT_NE(scan(plain, r, prev_x, prev_y), nullptr);
    EXPECT_EQ(r.x_text.data(), prev_x.data());
    EXPECT_EQ(r.y_text.data(), prev_y.data());
    // The last row of a buffer without a line end.
    const std::string last = "1,2,3e-2,+4.5";
    EXPECT_EQ(scan(last, r), last.data() + last.size());
    EXPECT_EQ(r.z, 3e-2);
    EXPECT_EQ(r.current, 4.5);
    for (const char* other : {"1,2,3,4\r\n", " 1,2,3,4\n", "1 ,2,3,4\n", "1,2, 3,4\n", "1,2,3,4 \n", "1\t2\t3\t4\n",
                              "# 1,2,3,4\n", "\n", ",2,3,4\n", "1,,3,4\n", "1,2,,4\n", "1,2,3,\n", "1,2,3,4,\n",
                              "1,2,3\n", "1,2,3,4,5\n", "1,2,3,nan\n", "1,2,3,inf\n", "1,2,3x,4\n", "1,2,3,4x\n",
                              "1,2,3,1e999\n", "x,2,3,4\n", "1,2"}) {
        EXPECT_EQ(scan(other, r), nullptr) << other;
    }
}

// One cell's text in a random format: fixed or exponent notation, 1 to 17 significant digits, an
// occasional '+', and now and then a mantissa longer than 19 digits (std::from_chars' path).
std::string number_text(double v, std::mt19937_64& rng) {
    const int kind = static_cast<int>(rng() % 8);
    const int digits = 1 + static_cast<int>(rng() % 17);
    std::string s;
    if (kind == 0) s = fmt::format("{:.{}e}", v, digits - 1);
    else if (kind == 1) s = fmt::format("{:.{}E}", v, digits - 1);
    else if (kind == 2) s = fmt::format("{:.22f}", v);
    else if (kind == 3) s = fmt::format("{}", v);
    else s = fmt::format("{:.{}f}", v, digits % 9);
    if (rng() % 16 == 0 && s[0] != '-') s = "+" + s;
    return s;
}

enum class style { plain_mixed, tab, semicolon_decimal_comma, crlf };

// A 5 x 4 grid of 24 samples per pixel (synthetic: I = 1000 pA exp(-20 z / nm) times a random
// factor) in `st`; plain_mixed: comma rows with comments, blank lines, CRLF rows, spaces and
// tabs around cells sprinkled in.
std::string grid_file_text(style st, unsigned seed) {
    std::mt19937_64 rng(seed);
    std::uniform_real_distribution<double> factor(0.5, 1.5);
    const char* sep = st == style::tab ? "\t" : st == style::semicolon_decimal_comma ? ";" : ",";
    std::string out = "# bias: 0.1 V\n";
    out += fmt::format("x [nm]{0}y [nm]{0}z [nm]{0}current [pA]{1}\n", sep, st == style::crlf ? "\r" : "");
    for (int iy = 0; iy < 4; ++iy) {
        for (int ix = 0; ix < 5; ++ix) {
            for (int k = 0; k < 24; ++k) {
                const double z = 0.4 * k / 23.0;
                std::string cells[4] = {fmt::format("{}", 0.5 * ix), fmt::format("{}", 0.5 * iy), number_text(z, rng),
                                        number_text(1000.0 * std::exp(-20.0 * z) * factor(rng), rng)};
                std::string row;
                const unsigned disturb = st == style::plain_mixed ? static_cast<unsigned>(rng() % 12) : 99;
                for (int c = 0; c < 4; ++c) {
                    if (c) row += disturb == 4 ? " , " : disturb == 5 ? "\t," : sep;
                    row += cells[c];
                }
                if (st == style::semicolon_decimal_comma)
                    for (char& ch : row)
                        if (ch == '.') ch = ',';
                if (disturb == 1) out += "# a comment line\n";
                if (disturb == 2) out += "\n";
                if (disturb == 6) row = " " + row;
                out += row + (st == style::crlf || disturb == 3 ? "\r\n" : "\n");
            }
        }
    }
    return out;
}

struct pixel_values {
    std::vector<double> z, current;
};

// Every pixel's samples, by position, read with the fast path on or off.
std::map<std::pair<double, double>, pixel_values> read_all(const std::string& path, bool fast, int threads) {
    detail::fast_rows_enabled() = fast;
    grid_read_options o;
    o.threads = threads;
    o.chunk_bytes = 4096;  // many chunks: pixels cut by chunk ends too
    std::mutex m;
    std::map<std::pair<double, double>, pixel_values> out;
    read_grid(path, o, [&](const grid_pixel_view& px, unsigned) {
        std::lock_guard lock(m);
        pixel_values& v = out[{px.x_m, px.y_m}];
        v.z.assign(px.z_m.begin(), px.z_m.end());
        v.current.assign(px.current_A.begin(), px.current_A.end());
    });
    detail::fast_rows_enabled() = true;
    return out;
}

bool same_bits(const std::vector<double>& a, const std::vector<double>& b) {
    return a.size() == b.size() && std::memcmp(a.data(), b.data(), a.size() * sizeof(double)) == 0;
}

TEST(fast_rows, grids_read_bit_for_bit_as_the_general_parser_reads_them) {
    temp_dir d;
    int files = 0;
    for (style st : {style::plain_mixed, style::tab, style::semicolon_decimal_comma, style::crlf}) {
        for (unsigned seed = 1; seed <= 6; ++seed) {
            const std::string p = d.file(fmt::format("g{}_{}.csv", static_cast<int>(st), seed), grid_file_text(st, seed));
            const auto general = read_all(p, false, 1);
            ASSERT_EQ(general.size(), 20u) << p;
            for (int threads : {1, 2}) {
                const auto fast = read_all(p, true, threads);
                ASSERT_EQ(fast.size(), general.size()) << p;
                for (const auto& [pos, v] : general) {
                    const pixel_values& f = fast.at(pos);
                    EXPECT_TRUE(same_bits(f.z, v.z)) << p << " pixel " << pos.first << "," << pos.second;
                    EXPECT_TRUE(same_bits(f.current, v.current)) << p << " pixel " << pos.first << "," << pos.second;
                }
            }
            ++files;
        }
    }
    EXPECT_EQ(files, 24);
    // The values are the file's, times the unit (nm -> m: 1e-9, pA -> A: 1e-12).
    const std::string one = d.file("one.csv", "x [nm],y [nm],z [nm],current [pA]\n0,0,0.125,1000.5\n0,0,0.25,12.25\n"
                                              "0,0,0.375,1.75\n");
    const auto v = read_all(one, true, 1).at({0.0, 0.0});
    EXPECT_EQ(v.z, (std::vector<double>{0.125 * 1e-9, 0.25 * 1e-9, 0.375 * 1e-9}));
    EXPECT_EQ(v.current, (std::vector<double>{1000.5 * 1e-12, 12.25 * 1e-12, 1.75 * 1e-12}));
}

TEST(fast_rows, damaged_rows_give_the_general_parser_message) {
    temp_dir d;
    const std::string head = "x [nm],y [nm],z [nm],current [pA]\n0,0,0.1,100\n0,0,0.2,50\n";
    for (const char* bad : {"0,0,0.3.1,20\n", "0,0,0.3\n", "0,0,0.3,20,7\n", "0,0,0.3,abc\n", "0,zz,0.3,20\n",
                            "0,0,0.3,1e999\n", "0,0,,20\n"}) {
        const std::string p = d.file("bad.csv", head + bad + "1,0,0.1,100\n");
        detail::fast_rows_enabled() = false;
        const std::string general = error_of([&] { read_grid(p, grid_read_options{}, [](const grid_pixel_view&, unsigned) {}); });
        detail::fast_rows_enabled() = true;
        const std::string fast = error_of([&] { read_grid(p, grid_read_options{}, [](const grid_pixel_view&, unsigned) {}); });
        EXPECT_NE(general, "(no error)") << bad;
        EXPECT_EQ(fast, general) << bad;
    }
}

}  // namespace
