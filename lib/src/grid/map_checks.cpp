#include "tipgap/grid/map_checks.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <string>

#include "tipgap/core/error.hpp"

namespace tipgap {

void require_fitted_pixel(const barrier_map& m) {
    if (std::any_of(m.apparent_barrier_J.begin(), m.apparent_barrier_J.end(), [](double v) { return std::isfinite(v); }))
        return;
    std::string counts;
    for (std::size_t q = 0; q < pixel_quality_count; ++q) {
        if (m.quality_counts[q] == 0) continue;
        counts += fmt::format("{}{} {}", counts.empty() ? "" : ", ", to_string(static_cast<pixel_quality>(q)), m.quality_counts[q]);
    }
    throw error(error_kind::no_answer, location{m.grid.path, 0, 0, ""},
                fmt::format("no pixel could be fitted ({}); check the noise floor, the current unit and the map's "
                            "limits on current decades and relative error",
                            counts.empty() ? "no pixels" : counts));
}

}  // namespace tipgap
