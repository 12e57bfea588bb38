#pragma once
// Standard normal deviates by the Box-Muller transform (Box & Muller, Ann. Math. Stat. 29, 610
// (1958)) from std::mt19937_64, whose output sequence the C++ standard fixes. std::normal_distribution
// is not used because its algorithm differs between standard libraries, and the synthetic demo
// files must regenerate byte-identically anywhere.
#include <cmath>
#include <cstdint>
#include <numbers>
#include <random>

namespace tipgap::detail {

class normal_source {
public:
    explicit normal_source(std::uint64_t seed) : rng_(seed) {}
    double next() {
        if (has_spare_) {
            has_spare_ = false;
            return spare_;
        }
        const double u1 = uniform_open();
        const double u2 = uniform_open();
        const double r = std::sqrt(-2.0 * std::log(u1));
        spare_ = r * std::sin(2.0 * std::numbers::pi * u2);
        has_spare_ = true;
        return r * std::cos(2.0 * std::numbers::pi * u2);
    }

private:
    // (0, 1) from the top 53 bits: never 0, so the logarithm is finite.
    double uniform_open() { return (static_cast<double>(rng_() >> 11) + 0.5) * 0x1p-53; }
    std::mt19937_64 rng_;
    double spare_ = 0.0;
    bool has_spare_ = false;
};

}  // namespace tipgap::detail
