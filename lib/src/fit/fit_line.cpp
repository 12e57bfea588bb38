// Weighted straight-line least squares from sums centred on the weighted mean of x (no raw
// normal equations, so the accuracy does not depend on the square of the condition number).
#include <algorithm>
#include <cmath>
#include <limits>
#include <fmt/format.h>

#include "tipgap/core/error.hpp"
#include "tipgap/fit/fit.hpp"

namespace tipgap {

line_fit fit_line(std::span<const double> x, std::span<const double> y, std::span<const double> weights) {
    const std::size_t n = x.size();
    line_fit out;
    out.points = n;
    const bool weighted = !weights.empty();
    // Non-finite data or weights make the SVD undefined (Eigen's JacobiSVD can then read out of
    // bounds), so they are refused here whatever the caller did. Weights are used relative to the
    // largest: the covariance is scaled by the residual variance, so a common factor drops out,
    // and the rescaling keeps sqrt(w) * y away from overflow.
    double w_max = 0.0;
    for (std::size_t i = 0; i < n; ++i) {
        const double wi = weighted ? weights[i] : 1.0;
        if (!std::isfinite(x[i]) || !std::isfinite(y[i]) || !std::isfinite(wi) || wi < 0.0) {
            throw_input(location{}, fmt::format("point {} of a straight-line fit is not finite (x {:g}, y {:g}, weight "
                                                "{:g}); expected finite values and weights >= 0",
                                                i + 1, x[i], y[i], wi));
        }
        w_max = std::max(w_max, wi);
    }
    if (!(w_max > 0.0)) throw_input(location{}, "every weight of a straight-line fit is 0; expected a positive weight");
    auto w = [&](std::size_t i) { return (weighted ? weights[i] : 1.0) / w_max; };

    // About the weighted mean of x the two columns of the design matrix (sqrt(w), sqrt(w)(x - x̄))
    // are orthogonal, so the least-squares problem is diagonal: the closed form below is what an
    // SVD or QR of the centred columns returns, up to rounding, without their cost (Bevington &
    // Robinson, Data Reduction and Error Analysis, 3rd ed. (2003), eqs. 6.12 and 6.21-6.22,
    // written about the weighted mean; the NIST StRD Norris test holds it to the certified values).
    double sw = 0.0, swx = 0.0, swy = 0.0;
    for (std::size_t i = 0; i < n; ++i) {
        sw += w(i);
        swx += w(i) * x[i];
        swy += w(i) * y[i];
    }
    const double x_mean = swx / sw;
    const double y_mean = swy / sw;
    double sxx = 0.0, sxy = 0.0, sst_w = 0.0;
    for (std::size_t i = 0; i < n; ++i) {
        const double dx = x[i] - x_mean, dy = y[i] - y_mean;
        sxx += w(i) * dx * dx;
        sxy += w(i) * dx * dy;
        sst_w += w(i) * dy * dy;
    }
    // All x equal: no slope (0, with an infinite standard error, as the minimum-norm SVD solution
    // gives), which callers report as singular.
    const double inv_sxx = sxx > 0.0 ? 1.0 / sxx : std::numeric_limits<double>::infinity();
    out.slope = sxx > 0.0 ? sxy / sxx : 0.0;
    out.intercept = y_mean - out.slope * x_mean;
    double ssr_w = 0.0, ssr = 0.0;
    for (std::size_t i = 0; i < n; ++i) {
        const double r = y[i] - (y_mean + out.slope * (x[i] - x_mean));
        ssr_w += w(i) * r * r;
        ssr += r * r;
    }
    const double dof = static_cast<double>(n) - 2.0;
    const double s2 = dof > 0 ? ssr_w / dof : 0.0;
    out.slope_stderr = std::sqrt(s2 * inv_sxx);
    out.intercept_stderr = std::sqrt(s2 * (1.0 / sw + x_mean * x_mean * inv_sxx));
    out.covariance = -x_mean * s2 * inv_sxx;
    out.residual_std = std::sqrt(s2) * std::sqrt(w_max);  // in the caller's weights, not the rescaled ones
    out.r_squared = sst_w > 0.0 ? 1.0 - ssr_w / sst_w : 1.0;
    out.residual_rms = std::sqrt(ssr / static_cast<double>(n));
    return out;
}

}  // namespace tipgap
