// Reading grids: exact messages for damaged files, bounded streaming with progress, and a
// directory of curve files giving the same map as one CSV.
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <fmt/format.h>
#include <functional>
#include <sstream>
#include <unistd.h>
#include <fstream>
#include <random>
#include <string>
#include <vector>

#include "grid/synthetic_grid.hpp"
#include "support/temp_dir.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/grid/grid.hpp"
#include "tipgap/grid/map.hpp"

namespace {

namespace fs = std::filesystem;
using namespace tipgap;
using namespace tipgap_test;

// ---------------------------------------------------------------------------------------------
// Damaged input: clear messages with file, line and column.
TEST(grid_read, truncated_and_unsorted_files_give_exact_errors) {
    const grid_spec g{3, 2, 8};
    temp_dir d;
    const std::string text = grid_text(g);  // 3 header lines, then 48 rows: lines 4..51
    auto run = [&](const std::string& name, const std::string& content) {
        const std::string p = d.file(name, content);
        return error_of([&] { make_barrier_map(p, options_with(2)); });
    };
    // Cut in the middle of the last row: the row misses cells.
    const std::string cut_mid = text.substr(0, text.size() - 12);
    EXPECT_EQ(run("mid.csv", cut_mid), d.file("mid.csv") + ":51:1: the row has 3 cells; the header on line 3 has 4 columns");
    // Cut after a whole row of the last pixel.
    const std::size_t last_rows = text.size() - pixel_rows(g, 2, 1, std::vector<double>(8, 1.0)).size();
    (void)last_rows;
    std::string cut_row = text;
    for (int k = 0; k < 3; ++k) cut_row.erase(cut_row.rfind('\n', cut_row.size() - 2) + 1);
    EXPECT_EQ(run("row.csv", cut_row), d.file("row.csv") +
                                            ":44:1: pixel (x = 2 nm, y = 1 nm) has 5 samples; the first pixel (line "
                                            "4) has 8; every pixel needs the same number (is the file cut short?); if the acquisition was "
                                            "aborted, 'tipgap map --partial' maps the pixels that are there");
    // Cut after a whole pixel.
    std::string cut_pixel = text;
    for (int k = 0; k < 8; ++k) cut_pixel.erase(cut_pixel.rfind('\n', cut_pixel.size() - 2) + 1);
    EXPECT_EQ(run("pixel.csv", cut_pixel), d.file("pixel.csv") +
                                               ": the pixels do not fill a grid: 5 pixels for 3 x values times 2 y "
                                               "values; pixel (x = 2 nm, y = 1 nm) is missing (is the file cut short?); if the acquisition "
                                               "was aborted, 'tipgap map --partial' maps the pixels that are there");
    // Unsorted: the first row of pixel (1, 0) moved to the top, before pixel (0, 0), so that
    // pixel (1, 0) starts on line 4 and again on line 13.
    std::string unsorted = text;
    const std::size_t a = unsorted.find("\n1,0,") + 1;        // first row of pixel (1, 0)
    const std::size_t b = unsorted.find('\n', a) + 1;
    const std::string row = unsorted.substr(a, b - a);
    unsorted.erase(a, b - a);
    unsorted.insert(unsorted.find("\n0,0,") + 1, row);
    EXPECT_EQ(run("unsorted.csv", unsorted),
              d.file("unsorted.csv") + ":13:1: pixel (x = 1 nm, y = 0 nm) appears again (first at line 4); each pixel's "
                                       "rows must be together, with every pixel once (rows of different pixels "
                                       "interleaved, or a pixel repeated?)");
    // A bad cell.
    std::string bad = text;
    bad.replace(bad.find("\n0,1,") + 1 + 4, 1, "q");
    const std::size_t bad_line = 4 + 3 * 8;
    EXPECT_EQ(run("bad.csv", bad), d.file("bad.csv") + fmt::format(":{}:5: 'q.000000' in column 'z' is not a number; expected a plain number such as 0.25 (the unit goes in the header)", bad_line));
    // Missing columns and units.
    EXPECT_EQ(run("nocol.csv", "x [nm],z [nm],current [pA]\n0,0,1\n"),
              d.file("nocol.csv") + ":1:1: the header has no 'y [<length unit>]' column; expected a header such as 'x "
                                    "[nm],y [nm],z [nm],current [pA]'");
    EXPECT_EQ(run("nounit.csv", "x,y [nm],z [nm],current [pA]\n"),
              d.file("nounit.csv") + ":1:1: column 'x' has no unit; write it in brackets, e.g. 'x [nm]'");
    EXPECT_EQ(run("empty.csv", "x [nm],y [nm],z [nm],current [pA]\n# nothing\n"),
              d.file("empty.csv") + ": no data rows after the header; expected one row per sample such as "
                                    "'0,0,0.01,812.5' under 'x [nm],y [nm],z [nm],current [pA]'");
}

TEST(grid_read, streams_with_bounded_buffers_and_reports_progress) {
    const grid_spec g{8, 8, 64};
    temp_dir d;
    const std::string text = grid_text(g);
    const std::string path = d.file("p.csv", text);
    grid_read_options o;
    o.threads = 2;
    o.chunk_bytes = 4096;
    std::vector<std::uint64_t> seen;
    o.progress = [&](std::uint64_t done, std::uint64_t total) {
        EXPECT_EQ(total, text.size());
        seen.push_back(done);
    };
    std::atomic<std::size_t> pixels{0}, samples{0};
    const grid_layout l = read_grid(path, o, [&](const grid_pixel_view& p, unsigned slot) {
        EXPECT_LE(slot, 2u);
        ++pixels;
        samples += p.z_m.size();
        EXPECT_EQ(p.z_m.size(), 64u);
        EXPECT_EQ(p.bias_V, 0.1);
        EXPECT_GE(p.where.line, 4);
    });
    EXPECT_EQ(pixels.load(), 64u);
    EXPECT_EQ(samples.load(), 64u * 64u);
    EXPECT_GT(seen.size(), text.size() / 4096 - 1);  // one report per chunk
    EXPECT_TRUE(std::is_sorted(seen.begin(), seen.end()));
    EXPECT_EQ(seen.back(), text.size());
    EXPECT_TRUE(l.warnings.empty());
    // No line end at the end of the file: read, with a warning.
    o.progress = nullptr;
    const grid_layout cut = read_grid(d.file("nl.csv", text.substr(0, text.size() - 1)), o, [](const grid_pixel_view&, unsigned) {});
    ASSERT_EQ(cut.warnings.size(), 1u);
    EXPECT_EQ(cut.pixels, 64u);
}

TEST(grid_read, directory_of_curve_files_gives_the_same_map_as_one_csv) {
    const grid_spec g{3, 2, 32};
    temp_dir d;
    const std::string text = grid_text(g);
    const std::string csv = d.file("grid.csv", text);
    fs::create_directory(d.path() / "curves");
    // Split the long CSV into one file per pixel with x/y metadata.
    std::istringstream in(text);
    std::string line;
    std::map<std::string, std::string> files;
    int n = 0;
    while (std::getline(in, line)) {
        if (++n <= 3) continue;
        const std::size_t c1 = line.find(','), c2 = line.find(',', c1 + 1);
        const std::string x = line.substr(0, c1), y = line.substr(c1 + 1, c2 - c1 - 1);
        std::string& f = files[fmt::format("p_{}_{}.csv", x, y)];
        if (f.empty()) f = fmt::format("# bias: 100 mV\n# x: {} nm\n# y: {} nm\nz [nm],current [pA]\n", x, y);
        f += line.substr(c2 + 1) + "\n";
    }
    for (const auto& [name, content] : files) d.file("curves/" + name, content);
    const barrier_map a = make_barrier_map(csv, options_with(2));
    const barrier_map b = make_barrier_map((d.path() / "curves").string(), options_with(2));
    EXPECT_TRUE(b.grid.directory);
    EXPECT_EQ(a.apparent_barrier_J, b.apparent_barrier_J);
    EXPECT_EQ(a.grid.x_m, b.grid.x_m);
    // A file without a position.
    d.file("curves/zz.csv", "z [nm],current [pA]\n0,1000\n0.1,130\n0.2,17\n");
    EXPECT_EQ(error_of([&] { make_barrier_map((d.path() / "curves").string(), options_with(2)); }),
              d.file("curves/zz.csv") + ": x: no lateral position in the metadata; every file of a grid directory needs "
                                        "'# x: <length>' and '# y: <length>' lines, e.g. '# x: 1.5 nm'");
}

}  // namespace
