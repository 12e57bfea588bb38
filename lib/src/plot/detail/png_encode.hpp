#pragma once
// A PNG file from an 8-bit RGB image in memory (what PLplot's memcairo device renders into),
// compressed for speed: each row with the "Sub" filter and zlib at level 1 (PNG specification,
// 2nd ed., W3C 2003, sections 9.2 and 10). Figures are mostly flat colour, so the files stay small
// while encoding takes a fraction of libpng's adaptive filtering at zlib's default level.
#include <cstddef>
#include <string>
#include <vector>

namespace tipgap::plot::detail {

// rgb: width * height * 3 bytes, rows top to bottom; width, height > 0. Writes `path` (replaced)
// and throws tipgap::error (input) when it cannot.
void write_png_rgb(const std::string& path, const std::vector<unsigned char>& rgb, int width, int height);

}  // namespace tipgap::plot::detail
