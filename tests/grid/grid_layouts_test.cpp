// The grid readers on other layouts (issue 10): the same grid written comma, tab, whitespace and
// semicolon separated with decimal commas, with extra columns chosen by name, header-less, with z
// growing towards the sample, and as a directory of tab-separated curve files, must give the same
// pixels bit for bit. Currents I = 1 nA exp(-2 κ z), κ = 10 /nm (Binnig et al., Appl. Phys. Lett.
// 40, 178 (1982)), written here to 6 decimals.
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <map>
#include <mutex>
#include <string>
#include <utility>
#include <vector>

#include "tipgap/core/error.hpp"
#include "support/temp_dir.hpp"
#include "tipgap/grid/grid.hpp"

using namespace tipgap;

namespace {

namespace fs = std::filesystem;

constexpr int nx = 3, ny = 2, points = 16;

struct pixel_values {
    std::vector<double> z_m, current_A;
    double bias_V = 0.0;
    bool operator==(const pixel_values& o) const { return z_m == o.z_m && current_A == o.current_A; }
};
using pixel_map = std::map<std::pair<double, double>, pixel_values>;

// z in nm and current in pA of sample k (text as written, 6 decimals).
std::string z_text(int k) { return fmt::format("{:.6f}", 0.4 * k / (points - 1)); }
std::string current_text(int ix, int k) { return fmt::format("{:.6f}", (1000.0 + ix) * std::exp(-20.0 * 0.4 * k / (points - 1))); }

// Rows of the grid: `row(ix, iy, k)` gives one line.
template <class Row>
std::string grid_text(const std::string& header, Row row) {
    std::string t = "# synthetic test grid\n# bias: 0.1 V\n" + header + "\n";
    for (int iy = 0; iy < ny; ++iy)
        for (int ix = 0; ix < nx; ++ix)
            for (int k = 0; k < points; ++k) t += row(ix, iy, k) + "\n";
    return t;
}

std::string comma(const std::string& s) {
    std::string out = s;
    for (char& c : out)
        if (c == '.') c = ',';
    return out;
}

using tipgap_test::temp_dir;

pixel_map read_pixels(const std::string& path, const reader_options& reader, grid_layout* layout = nullptr) {
    grid_read_options o;
    o.threads = 2;
    o.chunk_bytes = 4096;  // the smallest: pixels straddle chunks
    o.reader = reader;
    pixel_map out;
    std::mutex m;
    const grid_layout l = read_grid(path, o, [&](const grid_pixel_view& p, unsigned) {
        std::lock_guard lock(m);
        out[{p.x_m, p.y_m}] = pixel_values{{p.z_m.begin(), p.z_m.end()}, {p.current_A.begin(), p.current_A.end()}, p.bias_V};
    });
    if (layout) *layout = l;
    return out;
}

std::string reference_text() {
    return grid_text("x [nm],y [nm],z [nm],current [pA]",
                     [](int ix, int iy, int k) { return fmt::format("{},{},{},{}", ix, iy, z_text(k), current_text(ix, k)); });
}

}  // namespace

TEST(grid_layouts, every_delimiter_gives_the_same_pixels) {
    temp_dir d;
    const pixel_map reference = read_pixels(d.file("comma.csv", reference_text()), {});
    ASSERT_EQ(reference.size(), static_cast<std::size_t>(nx * ny));
    const std::string tab = grid_text("x (nm)\ty (nm)\tz (nm)\tI (pA)\t", [](int ix, int iy, int k) {
        return fmt::format("{}\t{}\t{}\t{}\t", ix, iy, z_text(k), current_text(ix, k));
    });
    EXPECT_EQ(read_pixels(d.file("tab.txt", tab), {}), reference);
    const std::string spaces = grid_text("x/nm  y/nm  z [nm]  current [pA]", [](int ix, int iy, int k) {
        return fmt::format("  {}   {}\t{}  {}  ", ix, iy, z_text(k), current_text(ix, k));
    });
    EXPECT_EQ(read_pixels(d.file("spaces.txt", spaces), {}), reference);
    const std::string semicolon = grid_text("x [nm];y [nm];z [nm];current [pA]\r", [](int ix, int iy, int k) {
        return fmt::format("{};{};{};{}\r", ix, iy, comma(z_text(k)), comma(current_text(ix, k)));
    });
    EXPECT_EQ(read_pixels(d.file("semicolon.csv", "\xEF\xBB\xBF" + semicolon), {}), reference);
}

TEST(grid_layouts, columns_by_name_or_index_headerless_and_units_given) {
    temp_dir d;
    const pixel_map reference = read_pixels(d.file("comma.csv", reference_text()), {});
    const std::string extra = grid_text("t (s)\tX (um)\tY (um)\tZ (pm)\tI_raw (nA)\tI (fA)", [](int ix, int iy, int k) {
        return fmt::format("{}\t{}\t{}\t{:.3f}\t7\t{:.3f}", k, ix * 0.001, iy * 0.001, 400.0 * k / (points - 1),
                           1000.0 * (1000.0 + ix) * std::exp(-20.0 * 0.4 * k / (points - 1)));
    });
    reader_options by_name;
    by_name.columns = {"x", "y", "z", "i"};
    const pixel_map named = read_pixels(d.file("extra.txt", extra), by_name);
    ASSERT_EQ(named.size(), reference.size());
    // The same digits in other units are multiplied by other factors: equal to a few ulp.
    constexpr double kUnitRounding = 1e-15;
    auto r = reference.begin();
    for (auto n = named.begin(); n != named.end(); ++n, ++r) {
        EXPECT_NEAR(n->first.first, r->first.first, kUnitRounding * 1e-9);
        ASSERT_EQ(n->second.z_m.size(), r->second.z_m.size());
        for (std::size_t k = 0; k < r->second.z_m.size(); ++k) {
            EXPECT_NEAR(n->second.z_m[k], r->second.z_m[k], kUnitRounding * r->second.z_m.back());
            EXPECT_NEAR(n->second.current_A[k], r->second.current_A[k], kUnitRounding * r->second.current_A[k]);
        }
    }
    const std::string bare = grid_text("", [](int ix, int iy, int k) {
        return fmt::format("{} {} {} {}", current_text(ix, k), z_text(k), ix, iy);
    }).substr(std::string("# synthetic test grid\n# bias: 0.1 V\n").size() + 1);  // no header line
    reader_options headerless;
    headerless.columns = {"3", "4", "2", "1"};
    headerless.xy_unit = "nm";
    headerless.z_unit = "nm";
    headerless.current_unit = "pA";
    headerless.bias_V = 0.1;
    EXPECT_EQ(read_pixels(d.file("bare.txt", bare), headerless), reference);
}

TEST(grid_layouts, z_growing_towards_the_sample_is_refused_and_read_with_flip_z) {
    temp_dir d;
    const std::string flipped = grid_text("x [nm],y [nm],z [nm],current [pA]", [](int ix, int iy, int k) {
        return fmt::format("{},{},-{},{}", ix, iy, z_text(k), current_text(ix, k));
    });
    const std::string path = d.file("flipped.csv", flipped);
    try {
        read_pixels(path, {});
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()),
                  path + ": |I| rises with z (in 6 of 6 pixels, by the median |I| of each pixel's quarters of largest "
                         "and smallest z): z must grow as the tip retracts; if z in this file grows as the tip "
                         "approaches, read it with --flip-z");
    }
    reader_options flip;
    flip.flip_z = true;
    const pixel_map reference = read_pixels(d.file("comma.csv", reference_text()), {});
    const pixel_map read = read_pixels(path, flip);
    ASSERT_EQ(read.size(), reference.size());
    // "-0.000000" flipped is +0: the same pixels, sample for sample.
    EXPECT_EQ(read, reference);
}

TEST(grid_layouts, bias_given_overrides_the_file_with_a_note) {
    temp_dir d;
    reader_options o;
    o.bias_V = 0.2;
    grid_layout layout;
    const pixel_map p = read_pixels(d.file("comma.csv", reference_text()), o, &layout);
    EXPECT_EQ(p.begin()->second.bias_V, 0.2);
    ASSERT_EQ(layout.notes.size(), 1u);
    EXPECT_EQ(layout.notes[0], "the file states bias 0.1 V; the given 0.2 V is used instead");
}

TEST(grid_layouts, directory_of_tab_separated_curve_files) {
    temp_dir d;
    const pixel_map reference = read_pixels(d.file("comma.csv", reference_text()), {});
    fs::create_directories(d.path() / "dir");
    for (int iy = 0; iy < ny; ++iy) {
        for (int ix = 0; ix < nx; ++ix) {
            std::string t = fmt::format("# x: {} nm\n# y: {} nm\nZ (nm)\tI (pA)\tAux (V)\n", ix, iy);
            for (int k = 0; k < points; ++k) t += fmt::format("{}\t{}\t0,5\n", comma(z_text(k)), comma(current_text(ix, k)));
            d.file(fmt::format("dir/p{}{}.csv", iy, ix), t);
        }
    }
    reader_options o;
    o.columns = {"x", "y", "Z", "I"};  // x and y come from the metadata; z and current from these columns
    o.bias_V = 0.1;
    grid_layout layout;
    EXPECT_EQ(read_pixels((d.path() / "dir").string(), o, &layout), reference);
    EXPECT_TRUE(layout.notes.empty());
}
