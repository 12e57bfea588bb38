// PNG encoding of an RGB image with zlib (see plot/detail/png_encode.hpp).
#include "plot/detail/png_encode.hpp"

#include <cstdint>
#include <cstdio>
#include <zlib.h>

#include "tipgap/core/error.hpp"

namespace tipgap::plot::detail {
namespace {

void put_u32(std::vector<unsigned char>& out, std::uint32_t v) {
    for (int shift = 24; shift >= 0; shift -= 8) out.push_back(static_cast<unsigned char>(v >> shift));
}

// One chunk: length, type, data, CRC-32 of type and data.
void put_chunk(std::vector<unsigned char>& out, const char* type, const unsigned char* data, std::size_t n) {
    put_u32(out, static_cast<std::uint32_t>(n));
    const std::size_t type_at = out.size();
    out.insert(out.end(), type, type + 4);
    out.insert(out.end(), data, data + n);
    const uLong crc = crc32(0L, out.data() + type_at, static_cast<uInt>(n + 4));
    put_u32(out, static_cast<std::uint32_t>(crc));
}

// The filtered scanlines: a filter byte 1 ("Sub") and each byte minus the one 3 bytes before.
std::vector<unsigned char> sub_filtered(const std::vector<unsigned char>& rgb, int width, int height) {
    const std::size_t row = static_cast<std::size_t>(width) * 3;
    std::vector<unsigned char> f(static_cast<std::size_t>(height) * (row + 1));
    for (std::size_t y = 0; y < static_cast<std::size_t>(height); ++y) {
        const unsigned char* src = rgb.data() + y * row;
        unsigned char* dst = f.data() + y * (row + 1);
        dst[0] = 1;
        for (std::size_t i = 0; i < 3 && i < row; ++i) dst[1 + i] = src[i];
        for (std::size_t i = 3; i < row; ++i) dst[1 + i] = static_cast<unsigned char>(src[i] - src[i - 3]);
    }
    return f;
}

}  // namespace

void write_png_rgb(const std::string& path, const std::vector<unsigned char>& rgb, int width, int height) {
    const location where{path, 0, 0, ""};
    const std::vector<unsigned char> raw = sub_filtered(rgb, width, height);
    uLongf packed_size = compressBound(static_cast<uLong>(raw.size()));
    std::vector<unsigned char> packed(packed_size);
    if (compress2(packed.data(), &packed_size, raw.data(), static_cast<uLong>(raw.size()), 1) != Z_OK)
        throw_input(where, "cannot compress the image");
    std::vector<unsigned char> out = {0x89, 'P', 'N', 'G', '\r', '\n', 0x1a, '\n'};
    std::vector<unsigned char> ihdr;
    put_u32(ihdr, static_cast<std::uint32_t>(width));
    put_u32(ihdr, static_cast<std::uint32_t>(height));
    ihdr.insert(ihdr.end(), {8, 2, 0, 0, 0});  // 8 bits, RGB, deflate, adaptive filtering, no interlace
    put_chunk(out, "IHDR", ihdr.data(), ihdr.size());
    put_chunk(out, "IDAT", packed.data(), packed_size);
    put_chunk(out, "IEND", nullptr, 0);
    std::FILE* f = std::fopen(path.c_str(), "wb");
    if (!f) throw_input(where, "cannot open for writing (does the directory exist and is it writable?)");
    const bool written = std::fwrite(out.data(), 1, out.size(), f) == out.size();
    if (std::fclose(f) != 0 || !written) throw_input(where, "cannot write the file (is the disk full?)");
}

}  // namespace tipgap::plot::detail
