// Which way z runs in a curve; see tipgap/io/orientation.hpp.
#include "tipgap/io/orientation.hpp"

#include <algorithm>
#include <cmath>
#include <numeric>
#include <vector>

namespace tipgap {

namespace {

// √10: half a decade between the quarters' medians.
constexpr double clear_ratio = 3.1622776601683795;
constexpr std::size_t min_quarter_points = 3;

double median_of(std::vector<double>& v) {
    const std::size_t mid = v.size() / 2;
    std::nth_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(mid), v.end());
    const double upper = v[mid];
    if (v.size() % 2 == 1) return upper;
    return 0.5 * (upper + *std::max_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(mid)));
}

}  // namespace

orientation_check check_orientation(std::span<const double> z_m, std::span<const double> current_A) {
    orientation_check out;
    const std::size_t n = std::min(z_m.size(), current_A.size());
    const std::size_t q = n / 4;
    out.quarter_points = q;
    if (q < min_quarter_points) return out;
    // Scratch reused per thread: the grid reader checks every pixel.
    thread_local std::vector<std::size_t> order;
    thread_local std::vector<double> near, far;
    order.resize(n);
    std::iota(order.begin(), order.end(), std::size_t{0});
    const bool ascending = std::is_sorted(z_m.begin(), z_m.begin() + static_cast<std::ptrdiff_t>(n));
    const bool descending = !ascending && std::is_sorted(z_m.rbegin() + static_cast<std::ptrdiff_t>(z_m.size() - n), z_m.rend());
    if (descending) std::reverse(order.begin(), order.end());
    if (!ascending && !descending)
        std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return z_m[a] < z_m[b]; });
    // The quarters must not overlap in z (a flat z gives no orientation).
    if (!(z_m[order[q - 1]] < z_m[order[n - q]])) return out;
    near.clear();
    far.clear();
    for (std::size_t k = 0; k < q; ++k) {
        near.push_back(std::abs(current_A[order[k]]));
        far.push_back(std::abs(current_A[order[n - 1 - k]]));
    }
    out.near_median_A = median_of(near);
    out.far_median_A = median_of(far);
    if (out.far_median_A > clear_ratio * out.near_median_A) out.orientation = z_orientation::current_rises;
    else if (out.near_median_A > clear_ratio * out.far_median_A) out.orientation = z_orientation::current_falls;
    return out;
}

}  // namespace tipgap
