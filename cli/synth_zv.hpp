#pragma once
// tipgap synth --zv: a synthetic constant-current z(V) trace (called from cmd_synth.cpp).
#include <cstddef>
#include <cstdint>
#include <string>

#include "tipgap/config/config.hpp"

namespace tipgap::cli {

struct zv_flags {
    std::string bias;      // --bias FROM..TO (empty: 4V..10V)
    std::string current;   // --current (empty: 1nA)
    std::string z_noise;   // --z-noise (empty: 0)
    std::size_t points = 121;
    std::uint64_t seed = 1;
    std::string out, truth, command_line;
};

// Parses the flags into tipgap::zv_synth_options, synthesises and writes the trace and its truth.
void run_synth_zv(const config& c, const zv_flags& f);

}  // namespace tipgap::cli
