#pragma once
// Small synthetic grids for the grid tests, written here (synthetic data: I = I0 exp(-2 κ z) +
// Gaussian noise, κ = sqrt(2 m φ)/ħ, Binnig et al., Appl. Phys. Lett. 40, 178 (1982); CODATA 2018
// constants from tipgap/core/constants.hpp).
#include <cmath>
#include <cstddef>
#include <fmt/format.h>
#include <functional>
#include <random>
#include <string>
#include <vector>

#include "tipgap/core/constants.hpp"
#include "tipgap/grid/map.hpp"

namespace tipgap_test {

using namespace tipgap;

// κ for a barrier φ: the inverse of φ = ħ²κ²/2m.
inline double kappa_for(double phi_eV) { return std::sqrt(2.0 * si::electron_mass * phi_eV * si::electron_volt) / si::hbar; }

struct grid_spec {
    int nx = 16, ny = 16, points = 64;
    double background_eV = 4.0, disc_eV = 3.0;
    double disc_radius_px = 5.0;       // centred disc
    double z_range_nm = 0.4;
    double i0_pA = 1000.0, noise_pA = 0.5;
    unsigned seed = 11;
};

inline bool in_disc(const grid_spec& g, int ix, int iy) {
    const double cx = 0.5 * (g.nx - 1), cy = 0.5 * (g.ny - 1);
    return (ix - cx) * (ix - cx) + (iy - cy) * (iy - cy) <= g.disc_radius_px * g.disc_radius_px;
}
inline double truth_eV(const grid_spec& g, int ix, int iy) { return in_disc(g, ix, iy) ? g.disc_eV : g.background_eV; }

// One pixel's samples in pA at z_k = k * range / (points - 1) nm.
inline std::vector<double> pixel_current(const grid_spec& g, double phi_eV, std::mt19937_64& rng) {
    std::normal_distribution<double> noise(0.0, g.noise_pA);
    std::vector<double> i(static_cast<std::size_t>(g.points));
    const double two_kappa_per_nm = 2.0 * kappa_for(phi_eV) * 1e-9;
    for (int k = 0; k < g.points; ++k) {
        const double z = g.z_range_nm * k / (g.points - 1);
        i[static_cast<std::size_t>(k)] = g.i0_pA * std::exp(-two_kappa_per_nm * z) + noise(rng);
    }
    return i;
}

inline std::string pixel_rows(const grid_spec& g, int ix, int iy, const std::vector<double>& current) {
    std::string s;
    for (int k = 0; k < g.points; ++k)
        s += fmt::format("{},{},{:.6f},{:.6g}\n", ix, iy, g.z_range_nm * k / (g.points - 1), current[static_cast<std::size_t>(k)]);
    return s;
}

// Row-major grid text; `special` may replace pixels' currents.
inline std::string grid_text(const grid_spec& g,
                      const std::function<void(int, int, std::vector<double>&)>& special = nullptr) {
    std::mt19937_64 rng(g.seed);
    std::string s = "# synthetic grid (tests/grid/synthetic_grid.hpp)\n# bias: 100 mV\nx [nm],y [nm],z [nm],current [pA]\n";
    for (int iy = 0; iy < g.ny; ++iy) {
        for (int ix = 0; ix < g.nx; ++ix) {
            std::vector<double> c = pixel_current(g, truth_eV(g, ix, iy), rng);
            if (special) special(ix, iy, c);
            s += pixel_rows(g, ix, iy, c);
        }
    }
    return s;
}

// Map options with `threads` readers and fitters and a read chunk of `chunk` bytes.
inline map_options options_with(int threads, std::size_t chunk = std::size_t{1} << 20) {
    map_options o;
    o.read.threads = threads;
    o.read.chunk_bytes = chunk;
    return o;
}

}  // namespace tipgap_test
