// libFuzzer target: the streaming grid reader (tipgap/grid.hpp) on a long-CSV grid, with reader
// options taken from the input's last byte (delimiter, columns, flip_z, bias; fuzz_common.hpp).
// The input goes through a file (read_grid reads paths) in the smallest chunks, so that pixels
// straddling chunk boundaries are exercised.
// Property: read_grid visits pixels with finite samples and equal spans, or throws tipgap::error.
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <string>
#include <string_view>
#include <unistd.h>

#include "fuzz_common.hpp"
#include "tipgap/grid/grid.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    static const std::string path = "/tmp/tipgap-fuzz-grid-" + std::to_string(::getpid()) + ".csv";
    std::string_view text(reinterpret_cast<const char*>(data), size);
    tipgap::grid_read_options options;
    options.reader = tipgap::fuzz::options_from_last_byte(text, 4);
    {
        std::ofstream out(path, std::ios::binary | std::ios::trunc);
        out.write(text.data(), static_cast<std::streamsize>(text.size()));
    }
    options.threads = 1;
    options.chunk_bytes = 4096;  // the smallest allowed: most inputs cross a chunk boundary
    tipgap::fuzz::expect_clean([&] {
        tipgap::read_grid(path, options, [](const tipgap::grid_pixel_view& p, unsigned) {
            if (p.z_m.size() != p.current_A.size() || !std::isfinite(p.x_m) || !std::isfinite(p.y_m)) std::abort();
            for (std::size_t i = 0; i < p.z_m.size(); ++i) {
                if (!std::isfinite(p.z_m[i]) || !std::isfinite(p.current_A[i])) std::abort();
            }
        });
    });
    return 0;
}
