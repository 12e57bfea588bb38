#pragma once
// Shared by the fuzz targets: run one parse, accept tipgap::error (the documented way to refuse
// input) and check that its message is a single clipped line; anything else escapes and libFuzzer
// reports it as a crash with the input.
#include <cstdlib>
#include <cstdio>
#include <string>
#include <string_view>

#include "tipgap/core/error.hpp"
#include "tipgap/io/reader_options.hpp"

namespace tipgap::fuzz {

// Every echoed piece of input is clipped to 60 bytes (quote_input), so no message comes near this
// even with several pieces and a long file name.
inline constexpr std::size_t max_message_bytes = 1000;

template <class F>
void expect_clean(F&& parse) {
    try {
        parse();
    } catch (const tipgap::error& e) {
        const std::string m = e.what();
        if (m.size() > max_message_bytes || m.find('\n') != std::string::npos) {
            std::fprintf(stderr, "message not one short line (%zu bytes): %.2000s\n", m.size(), m.c_str());
            std::abort();
        }
    }
}

// Reader options from the last byte of an input (so that the seeds, which are files, keep their
// text): bits 0-2 the delimiter (5 choices), bit 3 flip_z, bits 4-5 the columns (none; by index;
// by name, the second by the alias "I"; by index with units, which also reads header-less files),
// bit 6 a given bias. roles: 2 for a curve, 4 for a grid. The byte is removed from `text`.
inline reader_options options_from_last_byte(std::string_view& text, std::size_t roles) {
    reader_options o;
    if (text.empty()) return o;
    const unsigned char b = static_cast<unsigned char>(text.back());
    text.remove_suffix(1);
    o.delimiter = static_cast<delimiter_choice>((b & 7u) % 5u);
    o.flip_z = (b & 8u) != 0;
    const unsigned columns = (b >> 4) & 3u;
    const char* const index[] = {"1", "2", "3", "4"};
    const char* const name[] = {"x", "y", "z", "I"};
    for (std::size_t k = 0; columns != 0 && k < roles; ++k) {
        const std::size_t role = roles == 4 ? k : k + 2;  // a curve's roles are z and current
        o.columns.push_back(columns == 2 ? name[role] : index[k]);
    }
    if (columns == 3) {
        o.z_unit = "nm";
        o.current_unit = "pA";
        if (roles == 4) o.xy_unit = "nm";
    }
    if (b & 64u) o.bias_V = 0.1;
    return o;
}

}  // namespace tipgap::fuzz
