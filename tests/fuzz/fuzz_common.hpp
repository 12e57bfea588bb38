#pragma once
// Shared by the fuzz targets: run one parse, accept tipgap::error (the documented way to refuse
// input) and check that its message is a single clipped line; anything else escapes and libFuzzer
// reports it as a crash with the input.
#include <cstdlib>
#include <cstdio>
#include <string>

#include "tipgap/core/error.hpp"

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

}  // namespace tipgap::fuzz
