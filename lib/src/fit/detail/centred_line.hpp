#pragma once
// The weighted least-squares line from sums centred on the weighted mean of x, shared by fit_line
// (spans of x, y, w) and the per-pixel fit (points picked by index).
#include <cmath>
#include <cstddef>
#include <limits>

#include "tipgap/fit/fit.hpp"

namespace tipgap::detail {

// About the weighted mean of x the two columns of the design matrix (sqrt(w), sqrt(w)(x - x̄)) are
// orthogonal, so the least-squares problem is diagonal: this closed form is what an SVD or QR of
// the centred columns returns, up to rounding, without their cost (Bevington & Robinson, Data
// Reduction and Error Analysis, 3rd ed. (2003), eqs. 6.12 and 6.21-6.22, written about the weighted
// mean; the NIST StRD Norris test holds it to the certified values). x(k), y(k), w(k): the k-th
// point and its weight (> 0 somewhere), k < n. All x equal: slope 0 with an infinite standard
// error, as the minimum-norm SVD solution gives, which callers report as singular. residual_std is
// in the units of w as given.
template <class X, class Y, class W>
line_fit centred_line(std::size_t n, X x, Y y, W w) {
    double sw = 0.0, swx = 0.0, swy = 0.0;
    for (std::size_t k = 0; k < n; ++k) {
        sw += w(k);
        swx += w(k) * x(k);
        swy += w(k) * y(k);
    }
    const double x_mean = swx / sw, y_mean = swy / sw;
    double sxx = 0.0, sxy = 0.0, syy = 0.0;
    for (std::size_t k = 0; k < n; ++k) {
        const double dx = x(k) - x_mean, dy = y(k) - y_mean;
        sxx += w(k) * dx * dx;
        sxy += w(k) * dx * dy;
        syy += w(k) * dy * dy;
    }
    line_fit out;
    out.points = n;
    const bool spread = sxx > 0.0;
    out.slope = spread ? sxy / sxx : 0.0;
    out.intercept = y_mean - out.slope * x_mean;
    double ssr_w = 0.0, ssr = 0.0;
    for (std::size_t k = 0; k < n; ++k) {
        const double r = y(k) - (y_mean + out.slope * (x(k) - x_mean));
        ssr_w += w(k) * r * r;
        ssr += r * r;
    }
    const double dof = static_cast<double>(n) - 2.0;
    const double s2 = dof > 0 ? ssr_w / dof : 0.0;
    constexpr double inf = std::numeric_limits<double>::infinity();
    out.slope_stderr = spread ? std::sqrt(s2 / sxx) : inf;
    out.intercept_stderr = spread ? std::sqrt(s2 * (1.0 / sw + x_mean * x_mean / sxx)) : inf;
    out.covariance = spread ? -x_mean * s2 / sxx : -x_mean * inf;
    out.residual_std = std::sqrt(s2);
    out.r_squared = syy > 0.0 ? 1.0 - ssr_w / syy : 1.0;
    out.residual_rms = std::sqrt(ssr / static_cast<double>(n));
    return out;
}

}  // namespace tipgap::detail
