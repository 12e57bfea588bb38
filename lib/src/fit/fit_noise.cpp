// Noise level, noise floor and amplifier saturation of a sweep, estimated from the data.
#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <numeric>

#include "fit/detail/fit_internal.hpp"

namespace tipgap {
namespace detail {

// Scales a median absolute deviation to the standard deviation of a normal distribution,
// 1/Φ⁻¹(3/4) (Rousseeuw & Croux, J. Am. Stat. Assoc. 88, 1273 (1993)).
constexpr double mad_to_sigma = 1.482602218505602;

double median_in_place(std::span<double> v) {
    const std::size_t n = v.size();
    auto mid = v.begin() + static_cast<std::ptrdiff_t>(n / 2);
    std::nth_element(v.begin(), mid, v.end());
    double m = *mid;
    if (n % 2 == 0) m = 0.5 * (m + *std::max_element(v.begin(), mid));
    return m;
}

double median(std::vector<double> v) { return median_in_place(v); }

median_mad median_and_mad(std::span<double> v) {
    std::sort(v.begin(), v.end());
    const std::size_t n = v.size();
    const std::size_t half = n / 2;
    // As median_in_place: the upper middle value, averaged with the lower one for even n.
    const double m = n % 2 == 1 ? v[half] : 0.5 * (v[half] + v[half - 1]);
    // Deviations grow leftwards from j - 1 and rightwards from j; take them in order up to the
    // (half)-th smallest (0-based), remembering the one before for even n.
    std::size_t j = static_cast<std::size_t>(std::upper_bound(v.begin(), v.end(), m) - v.begin());
    std::size_t left = j, right = j;  // next: v[left - 1] on the left, v[right] on the right
    double previous = 0.0, current = 0.0;
    for (std::size_t k = 0; k <= half; ++k) {
        const bool take_left = left > 0 && (right == n || std::abs(v[left - 1] - m) <= std::abs(v[right] - m));
        previous = current;
        current = take_left ? std::abs(v[--left] - m) : std::abs(v[right++] - m);
    }
    return {m, n % 2 == 1 ? current : 0.5 * (current + previous)};
}

double mad(const std::vector<double>& v) {
    const double m = median(v);
    std::vector<double> d(v.size());
    std::transform(v.begin(), v.end(), d.begin(), [m](double x) { return std::abs(x - m); });
    return median(std::move(d));
}

std::string format_current(double current_A) {
    const double a = std::abs(current_A);
    if (a == 0.0) return "0 A";
    struct prefix {
        double scale;
        const char* unit;
    };
    constexpr prefix prefixes[] = {{1.0, "A"}, {1e-3, "mA"}, {1e-6, "uA"}, {1e-9, "nA"}, {1e-12, "pA"}, {1e-15, "fA"}};
    for (const auto& p : prefixes) {
        if (a >= p.scale * 0.9995) return fmt::format("{:.3g} {}", current_A / p.scale, p.unit);
    }
    return fmt::format("{:.3g} fA", current_A / 1e-15);
}

// An amplifier clips at one level, so a flat top shows as several maxima within 0.1 % of the
// maximum (a few ADC steps, common practice, no source); three such points make a flat top (two
// equal neighbours happen by chance on a coarse ADC). The top must also stand well clear of the
// noise (10 σ_I), or a curve of pure noise would count as saturated.
constexpr double flat_top_relative_band = 1e-3;
constexpr std::size_t flat_top_min_points = 3;
constexpr double flat_top_min_sigmas = 10.0;
// Amplifiers compress before they clip: points within 1 % of the flat top are dropped as well
// (common practice, no source).
constexpr double saturation_margin = 0.01;

double detect_saturation(std::span<const double> abs_current, double noise_A) {
    if (abs_current.empty()) return 0.0;
    const double top = *std::max_element(abs_current.begin(), abs_current.end());
    if (top < flat_top_min_sigmas * noise_A) return 0.0;
    const double band = flat_top_relative_band * top;
    const auto n_top = static_cast<std::size_t>(
        std::count_if(abs_current.begin(), abs_current.end(), [&](double a) { return a >= top - band; }));
    if (n_top < flat_top_min_points) return 0.0;
    return (top - band) * (1.0 - saturation_margin);
}

}  // namespace detail

// Tail size: enough points for a robust spread (8), a fifth of long sweeps, never more than half.
constexpr std::size_t tail_min_points = 8;
// Spread ratio below which the tail counts as flat (pure noise gives ~1; a tail still decaying
// over its length gives more). Common practice, no source.
constexpr double flat_tail_ratio = 2.0;
// A point is above the floor when it exceeds the floor level by 3 σ_I (common practice, no source).
constexpr double floor_sigmas = 3.0;

noise_estimate detail::noise_from_far_first(std::span<const double> far_first, std::vector<double>& scratch) {
    const std::size_t n = far_first.size();
    std::size_t tail_n = std::max(tail_min_points, n / 5);
    tail_n = std::min(tail_n, std::max<std::size_t>(n / 2, 3));
    tail_n = std::min(tail_n, n);
    const std::span<const double> tail = far_first.first(tail_n);

    // scratch holds the first differences, then the tail, each sorted in place by median_and_mad
    // (no allocation once it has grown to the tail length).
    scratch.resize(tail_n);
    std::span<double> buf(scratch);
    for (std::size_t k = 1; k < tail_n; ++k) buf[k - 1] = tail[k] - tail[k - 1];
    noise_estimate est;
    est.current_noise_A = mad_to_sigma * median_and_mad(buf.first(tail_n - 1)).mad / std::sqrt(2.0);
    std::copy(tail.begin(), tail.end(), buf.begin());
    const median_mad t = median_and_mad(buf);
    est.tail_offset_A = t.median;
    const double tail_spread = mad_to_sigma * t.mad;
    est.floor_reached = tail_spread < flat_tail_ratio * est.current_noise_A;
    est.noise_floor_A = floor_sigmas * est.current_noise_A + (est.floor_reached ? std::abs(est.tail_offset_A) : 0.0);
    return est;
}

noise_estimate estimate_noise(std::span<const double> z_m, std::span<const double> current_A) {
    const std::size_t n = z_m.size();
    std::vector<std::size_t> order(n);
    std::iota(order.begin(), order.end(), std::size_t{0});
    std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return z_m[a] > z_m[b]; });
    std::vector<double> far_first(n), scratch;
    for (std::size_t k = 0; k < n; ++k) far_first[k] = current_A[order[k]];
    return detail::noise_from_far_first(far_first, scratch);
}

}  // namespace tipgap
