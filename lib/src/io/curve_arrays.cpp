#include "tipgap/io/curve_arrays.hpp"

#include <cmath>
#include <fmt/format.h>

#include "tipgap/core/error.hpp"

namespace tipgap {

namespace {

void check_finite(const std::vector<double>& v, const char* key) {
    for (std::size_t i = 0; i < v.size(); ++i)
        if (!std::isfinite(v[i])) throw_input(location{"", 0, 0, key}, fmt::format("value {} is not finite; expected finite values", i));
}

}  // namespace

measured_curve curve_from_arrays(const std::string& name, std::vector<double> z_m, std::vector<double> current_A,
                                 double bias_V) {
    // A straight line through fewer than 3 points has no error estimate (the file reader's limit too).
    constexpr std::size_t min_points = 3;
    if (current_A.size() != z_m.size())
        throw_input(location{"", 0, 0, "current"},
                    fmt::format("{} values for {} z values; expected one current per z", current_A.size(), z_m.size()));
    if (z_m.size() < min_points)
        throw_input(location{"", 0, 0, "z"}, fmt::format("{} point{}; a curve needs at least {} points", z_m.size(),
                                                         z_m.size() == 1 ? "" : "s", min_points));
    check_finite(z_m, "z");
    check_finite(current_A, "current");
    measured_curve c;
    c.file = name;
    if (std::isfinite(bias_V)) {
        c.metadata.bias_V = bias_V;
        c.metadata.entries.emplace_back("bias", fmt::format("{} V", bias_V));
    }
    c.z_m = std::move(z_m);
    c.current_A = std::move(current_A);
    c.sweeps = split_at_turns(c.z_m, c.current_A);
    return c;
}

}  // namespace tipgap
