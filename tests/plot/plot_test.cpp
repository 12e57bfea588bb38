// Tests for the plotting module: formats by extension, real files with the right signatures, SVG
// text, atomic writes, binning, and a palette and series looks that survive a grey print.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <limits>
#include <set>
#include <sstream>
#include <string>
#include <unistd.h>
#include <vector>

#include "plot/detail/plot_style.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/plot/plot.hpp"

using namespace tipgap;
using namespace tipgap::plot;
namespace fs = std::filesystem;

namespace {

// A fresh directory per test, removed afterwards.
struct temp_dir {
    fs::path path;
    temp_dir() {
        path = fs::temp_directory_path() /
               ("tipgap_plot_test_" + std::to_string(::getpid()) + "_" +
                ::testing::UnitTest::GetInstance()->current_test_info()->name());
        fs::remove_all(path);
        fs::create_directories(path);
    }
    ~temp_dir() { fs::remove_all(path); }
    std::string file(const std::string& name) const { return (path / name).string(); }
    std::set<std::string> entries() const {
        std::set<std::string> out;
        for (const auto& e : fs::directory_iterator(path)) out.insert(e.path().filename().string());
        return out;
    }
};

std::string read_all(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}

// An exponential I(z) on a log axis with scattered "measurements", a band and reference lines.
xy_panel line_panel() {
    xy_panel p;
    p.title = "Current against gap";
    p.x_axis.label = "gap [nm]";
    p.y_axis.label = "current [A]";
    p.y_axis.scale = axis_scale::log10;
    series model{{}, {}, "model", draw_style::line};
    series points{{}, {}, "sample #3", draw_style::markers};
    band b{{}, {}, {}, "95 % band", 0};
    for (int i = 0; i <= 30; ++i) {
        const double z = 0.4 + 0.025 * i, current = 1e-9 * std::exp(-20.0 * (z - 0.5));
        model.x.push_back(z);
        model.y.push_back(current);
        b.x.push_back(z);
        b.y_low.push_back(0.8 * current);
        b.y_high.push_back(1.25 * current);
        if (i % 4 == 0) {
            points.x.push_back(z);
            points.y.push_back(current * (i % 8 == 0 ? 1.1 : 0.9));
        }
    }
    points.x.push_back(0.7);
    points.y.push_back(-1e-12);  // not shown on a log axis: must be skipped, not break the plot
    p.lines = {model, points};
    p.bands = {b};
    p.references = {{orientation::horizontal, 2e-12, "noise floor"}};
    p.notes = {{0.9, 1e-9, "κ = 10 nm⁻¹", 0.0}};
    return p;
}

// 4 × 3 cells, two without a value.
colour_map_panel map_panel() {
    colour_map_panel m;
    m.title = "Barrier map";
    m.x_axis.label = "x [nm]";
    m.y_axis.label = "y [nm]";
    m.x = {0.0, 1.0, 2.0, 3.0};
    m.y = {0.0, 1.0, 2.0};
    m.z = {4.1, 4.2, 4.3, 4.4, 4.0, std::nan(""), 4.5, 4.6, 3.9, 4.0, std::nan(""), 4.7};
    m.colour_bar_label = "apparent barrier [eV]";
    return m;
}

histogram_panel histogram() {
    histogram_panel h;
    h.title = "Barrier heights";
    h.x_axis.label = "apparent barrier [eV]";
    for (int i = 0; i < 200; ++i) h.values.push_back(4.0 + 0.5 * std::sin(0.37 * i));
    h.markers = {{orientation::vertical, 4.0, "mean"}, {orientation::vertical, 4.05, "median"}};
    return h;
}

figure one(panel p) {
    figure f;
    f.panels.push_back(std::move(p));
    return f;
}

// All text content of the SVG's <text> elements, one per line, via Debian's Python and its
// standard XML parser (a parse error makes the command fail).
std::vector<std::string> svg_texts(const std::string& svg, const std::string& out) {
    const std::string script =
        "import sys, xml.dom.minidom as m\n"
        "d = m.parse(sys.argv[1])\n"
        "assert d.documentElement.tagName == \"svg\"\n"
        "t = lambda n: \"\".join(c.data if c.nodeType == c.TEXT_NODE else t(c) for c in n.childNodes)\n"
        "open(sys.argv[2], \"w\", encoding=\"utf-8\").write(\"\\n\".join(t(e) for e in d.getElementsByTagName(\"text\")))\n";
    const std::string cmd = std::string(TIPGAP_PYTHON) + " -c '" + script + "' '" + svg + "' '" + out + "'";
    EXPECT_EQ(std::system(cmd.c_str()), 0) << "SVG did not parse as XML: " << svg;
    std::vector<std::string> lines;
    std::istringstream in(read_all(out));
    for (std::string line; std::getline(in, line);) lines.push_back(line);
    return lines;
}

bool contains(const std::vector<std::string>& v, const std::string& s) {
    return std::find(v.begin(), v.end(), s) != v.end();
}

std::uint32_t big_endian_u32(const std::string& s, std::size_t at) {
    return (static_cast<std::uint32_t>(static_cast<unsigned char>(s[at])) << 24) |
           (static_cast<std::uint32_t>(static_cast<unsigned char>(s[at + 1])) << 16) |
           (static_cast<std::uint32_t>(static_cast<unsigned char>(s[at + 2])) << 8) |
           static_cast<std::uint32_t>(static_cast<unsigned char>(s[at + 3]));
}

// PNG signature, ISO/IEC 15948 (PNG specification) section 5.2.
const std::string png_signature("\x89PNG\r\n\x1a\n", 8);

// CIE 1976 L* of an sRGB colour: IEC 61966-2-1 decoding, Rec. 709 luminance weights, CIE L*
// formula. Written out here independently of the library's OKLab code.
double cie_lightness(rgb c) {
    auto lin = [](unsigned char v) {
        const double x = v / 255.0;
        return x <= 0.04045 ? x / 12.92 : std::pow((x + 0.055) / 1.055, 2.4);
    };
    const double y = 0.2126 * lin(c.r) + 0.7152 * lin(c.g) + 0.0722 * lin(c.b);
    return y > 216.0 / 24389.0 ? 116.0 * std::cbrt(y) - 16.0 : 24389.0 / 27.0 * y;
}

}  // namespace

TEST(plot, format_from_extension) {
    EXPECT_EQ(format_from_path("a/b.png"), file_format::png);
    EXPECT_EQ(format_from_path("b.SVG"), file_format::svg);
    EXPECT_EQ(format_from_path("c.d/e.Pdf"), file_format::pdf);
}

TEST(plot, unknown_extension_is_an_input_error_naming_file_and_choices) {
    try {
        format_from_path("out/fig.jpeg");
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), "out/fig.jpeg: unknown plot file extension '.jpeg'; expected .png, .svg or .pdf");
        EXPECT_EQ(e.kind(), error_kind::input);
    }
    try {
        write_figure(one(line_panel()), "figure");
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), "figure: plot file has no extension; expected .png, .svg or .pdf");
    }
}

TEST(plot, png_files_have_signature_and_page_size) {
    temp_dir dir;
    const std::vector<std::pair<std::string, figure>> cases = {
        {"line.png", one(line_panel())}, {"map.png", one(map_panel())}, {"hist.png", one(histogram())}};
    for (const auto& [name, fig] : cases) {
        write_figure(fig, dir.file(name));
        const std::string png = read_all(dir.file(name));
        ASSERT_GT(png.size(), 1000u) << name;
        EXPECT_EQ(png.substr(0, 8), png_signature) << name;
        // IHDR follows the signature: width and height in pixels (PNG specification 11.2.2).
        EXPECT_EQ(png.substr(12, 4), "IHDR") << name;
        EXPECT_EQ(big_endian_u32(png, 16), 800u) << name;
        EXPECT_EQ(big_endian_u32(png, 20), 560u) << name;
    }
    EXPECT_EQ(dir.entries(), (std::set<std::string>{"hist.png", "line.png", "map.png"}));  // no temporaries
}

TEST(plot, grid_figure_page_is_columns_by_rows_plus_title_band) {
    temp_dir dir;
    figure f;
    f.title = "Four panels";
    f.columns = 2;
    f.panel_width = 500;
    f.panel_height = 400;
    f.panels = {line_panel(), map_panel(), histogram()};
    write_figure(f, dir.file("grid.png"));
    const std::string png = read_all(dir.file("grid.png"));
    ASSERT_EQ(png.substr(0, 8), png_signature);
    EXPECT_EQ(big_endian_u32(png, 16), 1000u);    // 2 columns × 500
    EXPECT_EQ(big_endian_u32(png, 20), 848u);     // 2 rows × 400 + the 48-pixel title band
}

TEST(plot, pdf_files_are_pdf) {
    temp_dir dir;
    for (const auto& [name, fig] : std::vector<std::pair<std::string, figure>>{
             {"line.pdf", one(line_panel())}, {"map.pdf", one(map_panel())}, {"hist.pdf", one(histogram())}}) {
        write_figure(fig, dir.file(name));
        const std::string pdf = read_all(dir.file(name));
        ASSERT_GT(pdf.size(), 1000u) << name;
        EXPECT_EQ(pdf.substr(0, 5), "%PDF-") << name;
        // A complete file ends with the end-of-file marker (ISO 32000-1, 7.5.5), maybe plus a newline.
        EXPECT_NE(pdf.find("%%EOF", pdf.size() - 8), std::string::npos) << name;
        EXPECT_NE(pdf.find("/MediaBox [ 0 0 800 560 ]"), std::string::npos) << name;
    }
}

TEST(plot, svg_parses_as_xml_and_keeps_labels_as_text) {
    temp_dir dir;
    write_figure(one(line_panel()), dir.file("line.svg"));
    write_figure(one(map_panel()), dir.file("map.svg"));
    write_figure(one(histogram()), dir.file("hist.svg"));

    const auto line = svg_texts(dir.file("line.svg"), dir.file("line.txt"));
    for (const char* s : {"gap [nm]", "current [A]", "Current against gap", "model", "sample #3", "95 % band",
                          "noise floor", "κ = 10 nm⁻¹"})
        EXPECT_TRUE(contains(line, s)) << "line.svg lacks text '" << s << "'";
    // Log axis numbers are 10 with a superscript exponent.
    EXPECT_TRUE(contains(line, "10-9")) << "no decade label 10^-9";

    const auto map = svg_texts(dir.file("map.svg"), dir.file("map.txt"));
    for (const char* s : {"x [nm]", "y [nm]", "Barrier map", "apparent barrier [eV]", "no value: 2 of 12 cells"})
        EXPECT_TRUE(contains(map, s)) << "map.svg lacks text '" << s << "'";

    const auto hist = svg_texts(dir.file("hist.svg"), dir.file("hist.txt"));
    for (const char* s : {"apparent barrier [eV]", "count", "Barrier heights", "mean", "median"})
        EXPECT_TRUE(contains(hist, s)) << "hist.svg lacks text '" << s << "'";
}

TEST(plot, figures_in_a_row_do_not_share_state) {
    // A colour map changes colour maps, fonts and hatching; a line plot drawn before and after it
    // must come out byte for byte the same (PNG from cairo carries no time stamp).
    temp_dir dir;
    write_figure(one(line_panel()), dir.file("before.png"));
    write_figure(one(map_panel()), dir.file("map.png"));
    write_figure(one(histogram()), dir.file("hist.png"));
    write_figure(one(line_panel()), dir.file("after.png"));
    const std::string before = read_all(dir.file("before.png")), after = read_all(dir.file("after.png"));
    ASSERT_FALSE(before.empty());
    EXPECT_TRUE(before == after) << "second rendering differs from the first";
}

TEST(plot, unwritable_target_throws_and_leaves_nothing) {
    temp_dir dir;
    const std::string target = dir.file("missing/fig.png");
    try {
        write_figure(one(line_panel()), target);
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), target + ": cannot open for writing (does the directory exist and is it writable?)");
        EXPECT_EQ(e.kind(), error_kind::input);
    }
    EXPECT_TRUE(dir.entries().empty());
}

TEST(plot, bad_data_throws_before_writing_and_keeps_the_old_file) {
    temp_dir dir;
    const std::string target = dir.file("fig.png");
    { std::ofstream(target) << "old"; }
    xy_panel p = line_panel();
    p.lines[0].y.pop_back();
    try {
        write_figure(one(p), target);
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), target + ": panel 1: series 1 'model': x and y differ in length (31 and 30)");
    }
    colour_map_panel m = map_panel();
    m.z.pop_back();
    figure two;
    two.panels = {line_panel(), m};
    try {
        write_figure(two, target);
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), target + ": panel 2: colour map: z has 11 values; expected 12 (ny = 3 rows of nx = 4)");
    }
    xy_panel q = line_panel();
    q.y_axis.min = 0.0;
    EXPECT_THROW(
        {
            try {
                write_figure(one(q), target);
            } catch (const error& e) {
                EXPECT_EQ(std::string(e.what()), target + ": panel 1: y axis: min must be > 0 on a log axis");
                throw;
            }
        },
        error);
    figure cols = one(line_panel());
    cols.columns = 2;
    EXPECT_THROW(write_figure(cols, target), error);
    EXPECT_EQ(read_all(target), "old");
    EXPECT_EQ(dir.entries(), (std::set<std::string>{"fig.png"}));
}

TEST(plot, new_figure_replaces_an_old_file) {
    temp_dir dir;
    const std::string target = dir.file("fig.svg");
    { std::ofstream(target) << "old"; }
    write_figure(one(histogram()), target);
    EXPECT_EQ(read_all(target).substr(0, 5), "<?xml");
    EXPECT_EQ(dir.entries(), (std::set<std::string>{"fig.svg"}));
}

TEST(plot, histogram_fixed_bin_count_matches_numpy) {
    // numpy.histogram(numpy.arange(0, 11), bins=5) gives edges 0, 2, ..., 10 and counts
    // 2, 2, 2, 2, 3 (last bin closed): NumPy as a reference library.
    std::vector<double> v;
    for (int i = 0; i <= 10; ++i) v.push_back(i);
    const histogram_bins h = make_histogram(v, 5);
    ASSERT_EQ(h.edges.size(), 6u);
    for (int i = 0; i <= 5; ++i) EXPECT_DOUBLE_EQ(h.edges[static_cast<std::size_t>(i)], 2.0 * i);
    EXPECT_EQ(h.counts, (std::vector<std::size_t>{2, 2, 2, 2, 3}));
    EXPECT_EQ(h.left_out, 0u);
}

TEST(plot, histogram_automatic_bins_follow_freedman_diaconis) {
    // numpy.histogram_bin_edges(numpy.arange(1, 101), bins="fd") gives 5 bins, edges
    // 1, 20.8, 40.6, 60.4, 80.2, 100: NumPy as a reference library.
    std::vector<double> v;
    for (int i = 1; i <= 100; ++i) v.push_back(i);
    const histogram_bins h = make_histogram(v, 0);
    ASSERT_EQ(h.counts.size(), 5u);
    constexpr double edge_tolerance = 1e-12;  // evenly spaced edges, a few ulp of 100
    const std::vector<double> numpy_edges{1, 20.8, 40.6, 60.4, 80.2, 100};
    for (std::size_t i = 0; i < numpy_edges.size(); ++i) EXPECT_NEAR(h.edges[i], numpy_edges[i], edge_tolerance);
    EXPECT_EQ(h.counts, (std::vector<std::size_t>{20, 20, 20, 20, 20}));
}

TEST(plot, histogram_edges_and_left_out_values) {
    const std::vector<double> v{-1.0, 0.0, 0.5, 1.0, 1.5, 2.0, 3.0, std::nan(""), std::numeric_limits<double>::infinity()};
    const histogram_bins h = make_histogram(v, 0, {0.0, 1.0, 2.0});
    EXPECT_EQ(h.counts, (std::vector<std::size_t>{2, 3}));  // [0,1): 0, 0.5; [1,2]: 1, 1.5, 2
    EXPECT_EQ(h.left_out, 4u);                              // -1, 3, NaN, inf
    EXPECT_THROW(make_histogram(v, 0, {0.0, 0.0, 1.0}), error);
    try {
        make_histogram(v, -1);
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()), "histogram: bin count -1 is out of range; expected 0 (automatic) to 10000");
    }
}

TEST(plot, palette_lightness_rises_monotonically) {
    // Grey prints keep the order of values only if lightness rises steadily along the palette.
    double previous = -1.0;
    for (int i = 0; i <= 32; ++i) {
        const double l = cie_lightness(palette_colour(i / 32.0));
        EXPECT_GT(l, previous + 1.0) << "step " << i;  // ≥ 1 L* per 1/32: a visible step (common practice, no source)
        previous = l;
    }
    for (int i = 1; i <= 255; ++i)  // no reversal even at 8-bit resolution
        EXPECT_GE(cie_lightness(palette_colour(i / 255.0)) + 0.5, cie_lightness(palette_colour((i - 1) / 255.0)));
    // Design limits: the dark end contrasts with white paper, the light end is not white.
    EXPECT_LT(cie_lightness(palette_colour(0.0)), 30.0);
    EXPECT_GT(cie_lightness(palette_colour(1.0)), 85.0);
    EXPECT_LT(cie_lightness(palette_colour(1.0)), 97.0);
    // t outside [0, 1] is clamped.
    EXPECT_EQ(palette_colour(-3.0).r, palette_colour(0.0).r);
    EXPECT_EQ(palette_colour(7.0).g, palette_colour(1.0).g);
}

TEST(plot, series_looks_stay_distinct_in_grey) {
    // Neighbouring looks (series 1 and 2, 2 and 3, ...) must differ in grey level by at least
    // 12 L*, which survives office printers' halftoning (common practice, no source), and every
    // look must differ from every other in dash pattern and marker.
    constexpr double min_neighbour_lightness_step = 12.0;
    for (std::size_t i = 0; i < detail::look_count; ++i) {
        const auto& a = detail::look_at(static_cast<int>(i));
        const auto& b = detail::look_at(static_cast<int>((i + 1) % detail::look_count));
        EXPECT_GE(std::abs(cie_lightness(a.colour) - cie_lightness(b.colour)), min_neighbour_lightness_step) << i;
        EXPECT_LT(cie_lightness(a.colour), 80.0) << "look " << i << " too pale on white";
        for (std::size_t j = i + 1; j < detail::look_count; ++j) {
            const auto& c = detail::look_at(static_cast<int>(j));
            EXPECT_FALSE(a.dash == c.dash) << i << " " << j;
            EXPECT_NE(std::string(a.marker), std::string(c.marker)) << i << " " << j;
        }
    }
}

TEST(plot, text_escapes_plplot_escape_character) {
    EXPECT_EQ(detail::plplot_text("sample #3 ## x"), "sample ##3 #### x");
    EXPECT_EQ(detail::plplot_text("κ [nm⁻¹]"), "κ [nm⁻¹]");
}
