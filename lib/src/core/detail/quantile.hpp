#pragma once
// Sample quantiles, used by plan (Monte Carlo coverage intervals) and plot (histogram bin widths).
// Internal: not part of the installed headers.
#include <algorithm>
#include <cmath>
#include <cstddef>
#include <vector>

namespace tipgap::detail {

// Quantile of sorted finite data, definition 7 of Hyndman & Fan (1996), numpy's default: linear
// interpolation between order statistics at (n - 1) p. sorted: ascending, non-empty; p in [0, 1]
// (clamped).
inline double quantile_sorted(const std::vector<double>& sorted, double p) {
    const double h = (static_cast<double>(sorted.size()) - 1.0) * std::clamp(p, 0.0, 1.0);
    const std::size_t i = static_cast<std::size_t>(std::floor(h));
    if (i + 1 >= sorted.size()) return sorted.back();
    return sorted[i] + (h - static_cast<double>(i)) * (sorted[i + 1] - sorted[i]);
}

}  // namespace tipgap::detail
