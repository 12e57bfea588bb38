#pragma once
// Rows of a synthesised curve as one sweep, for tests that fit synthetic data directly.
#include <cstddef>

#include "tipgap/fit/fit.hpp"
#include "tipgap/synth/synth.hpp"

namespace tipgap_test {

// Rows first .. first + rows - 1 of c; the direction is that of the first row.
inline tipgap::curve_sweep as_sweep(const tipgap::synth_curve& c, std::size_t first, std::size_t rows) {
    tipgap::curve_sweep s;
    s.direction = c.samples[first].direction;
    for (std::size_t k = first; k < first + rows; ++k) {
        s.z_m.push_back(c.samples[k].z_m);
        s.current_A.push_back(c.samples[k].current_A);
    }
    return s;
}

}  // namespace tipgap_test
