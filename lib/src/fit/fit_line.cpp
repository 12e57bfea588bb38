// Weighted straight-line least squares (detail::centred_line) with its inputs checked.
#include <algorithm>
#include <cmath>
#include <fmt/format.h>

#include "fit/detail/centred_line.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/fit/fit.hpp"

namespace tipgap {

line_fit fit_line(std::span<const double> x, std::span<const double> y, std::span<const double> weights) {
    const std::size_t n = x.size();
    const bool weighted = !weights.empty();
    // Non-finite data or weights make the fit undefined, so they are refused here whatever the
    // caller did. Weights are used relative to the largest: the covariance is scaled by the
    // residual variance, so a common factor drops out, and the rescaling keeps the sums away from
    // overflow.
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

    line_fit out = detail::centred_line(
        n, [&](std::size_t i) { return x[i]; }, [&](std::size_t i) { return y[i]; }, w);
    out.residual_std *= std::sqrt(w_max);  // in the caller's weights, not the rescaled ones
    return out;
}

}  // namespace tipgap
