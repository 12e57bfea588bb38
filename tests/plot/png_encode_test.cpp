// The PNG encoder of the figures (plot/detail/png_encode.hpp): a file that a decoder written from
// the PNG specification (2nd ed., W3C 2003: chunk CRCs, zlib stream, "Sub" unfiltering) reads
// back to the same RGB bytes.
#include <gtest/gtest.h>

#include <cstdint>
#include <fstream>
#include <iterator>
#include <random>
#include <string>
#include <vector>
#include <zlib.h>

#include "plot/detail/png_encode.hpp"
#include "support/temp_dir.hpp"

namespace {

std::uint32_t be32(const std::string& s, std::size_t at) {
    std::uint32_t v = 0;
    for (std::size_t k = 0; k < 4; ++k) v = (v << 8) | static_cast<unsigned char>(s[at + k]);
    return v;
}

struct decoded {
    std::uint32_t width = 0, height = 0;
    std::vector<unsigned char> rgb;
};

// Reads an 8-bit RGB, non-interlaced PNG whose rows use filters 0 (None) or 1 (Sub).
decoded decode(const std::string& png) {
    decoded out;
    EXPECT_EQ(png.substr(0, 8), std::string("\x89PNG\r\n\x1a\n", 8));
    std::string idat;
    std::size_t at = 8;
    bool end = false;
    while (at + 12 <= png.size()) {
        const std::uint32_t n = be32(png, at);
        const std::string type = png.substr(at + 4, 4);
        const std::string data = png.substr(at + 8, n);
        const uLong crc = crc32(0L, reinterpret_cast<const Bytef*>(png.data() + at + 4), n + 4);
        EXPECT_EQ(be32(png, at + 8 + n), static_cast<std::uint32_t>(crc)) << type;
        if (type == "IHDR") {
            out.width = be32(data, 0);
            out.height = be32(data, 4);
            EXPECT_EQ(data.substr(8, 5), std::string("\x08\x02\x00\x00\x00", 5));
        }
        if (type == "IDAT") idat += data;
        if (type == "IEND") end = true;
        at += 12 + n;
    }
    EXPECT_TRUE(end);
    EXPECT_EQ(at, png.size());
    const std::size_t row = out.width * 3;
    std::vector<unsigned char> raw(out.height * (row + 1));
    uLongf raw_size = raw.size();
    EXPECT_EQ(uncompress(raw.data(), &raw_size, reinterpret_cast<const Bytef*>(idat.data()), idat.size()), Z_OK);
    EXPECT_EQ(raw_size, raw.size());
    for (std::size_t y = 0; y < out.height; ++y) {
        const unsigned char filter = raw[y * (row + 1)];
        EXPECT_TRUE(filter == 0 || filter == 1);
        for (std::size_t x = 0; x < row; ++x) {
            unsigned char v = raw[y * (row + 1) + 1 + x];
            if (filter == 1 && x >= 3) v = static_cast<unsigned char>(v + out.rgb[y * row + x - 3]);
            out.rgb.push_back(v);
        }
    }
    return out;
}

TEST(png_encode, decodes_to_the_same_pixels) {
    tipgap_test::temp_dir d;
    std::mt19937 rng(5);
    for (const auto& [w, h] : {std::pair{1, 1}, std::pair{7, 3}, std::pair{64, 40}}) {
        std::vector<unsigned char> rgb(static_cast<std::size_t>(w * h * 3));
        // Flat areas (as in figures) with random specks.
        for (std::size_t i = 0; i < rgb.size(); ++i) rgb[i] = rng() % 5 == 0 ? static_cast<unsigned char>(rng()) : 200;
        const std::string path = d.file("x.png");
        tipgap::plot::detail::write_png_rgb(path, rgb, w, h);
        std::ifstream f(path, std::ios::binary);
        const decoded back = decode(std::string(std::istreambuf_iterator<char>(f), {}));
        EXPECT_EQ(back.width, static_cast<std::uint32_t>(w));
        EXPECT_EQ(back.height, static_cast<std::uint32_t>(h));
        EXPECT_EQ(back.rgb, rgb) << w << "x" << h;
    }
}

TEST(png_encode, an_unwritable_path_is_an_error) {
    const std::vector<unsigned char> rgb(3, 0);
    EXPECT_THROW(tipgap::plot::detail::write_png_rgb("/nonexistent_dir_for_tipgap/x.png", rgb, 1, 1), tipgap::error);
}

}  // namespace
