// Weighted straight-line least squares by SVD (no normal equations, so the accuracy does not
// depend on the square of the condition number).
#include <Eigen/SVD>
#include <algorithm>
#include <cmath>
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

    // Centre and scale x so that the two columns of the design matrix are comparable: with z in
    // metres the raw columns differ by ~1e9.
    double sw = 0.0, swx = 0.0, swy = 0.0;
    for (std::size_t i = 0; i < n; ++i) {
        sw += w(i);
        swx += w(i) * x[i];
        swy += w(i) * y[i];
    }
    const double x_mean = swx / sw;
    const double y_mean = swy / sw;
    double sxx = 0.0;
    for (std::size_t i = 0; i < n; ++i) sxx += w(i) * (x[i] - x_mean) * (x[i] - x_mean);
    const double x_scale = sxx > 0.0 ? std::sqrt(sxx / sw) : 1.0;

    Eigen::MatrixXd a(static_cast<Eigen::Index>(n), 2);
    Eigen::VectorXd b(static_cast<Eigen::Index>(n));
    for (std::size_t i = 0; i < n; ++i) {
        const double sqw = std::sqrt(w(i));
        const auto r = static_cast<Eigen::Index>(i);
        a(r, 0) = sqw;
        a(r, 1) = sqw * (x[i] - x_mean) / x_scale;
        b(r) = sqw * y[i];
    }
    Eigen::JacobiSVD<Eigen::MatrixXd> svd(a, Eigen::ComputeThinU | Eigen::ComputeThinV);
    const Eigen::Vector2d p = svd.solve(b);

    double ssr_w = 0.0, ssr = 0.0, sst_w = 0.0;
    for (std::size_t i = 0; i < n; ++i) {
        const double fit = p(0) + p(1) * (x[i] - x_mean) / x_scale;
        const double r = y[i] - fit;
        ssr_w += w(i) * r * r;
        ssr += r * r;
        sst_w += w(i) * (y[i] - y_mean) * (y[i] - y_mean);
    }
    const double dof = static_cast<double>(n) - 2.0;
    const double s2 = dof > 0 ? ssr_w / dof : 0.0;

    // cov(p) = s² V S⁻² Vᵀ, then back to (intercept, slope) through the linear map T.
    const Eigen::Vector2d sv = svd.singularValues();
    const Eigen::Matrix2d v = svd.matrixV();
    Eigen::Matrix2d cov_p = v * Eigen::Vector2d(1.0 / (sv(0) * sv(0)), 1.0 / (sv(1) * sv(1))).asDiagonal() *
                            v.transpose() * s2;
    Eigen::Matrix2d t;
    t << 1.0, -x_mean / x_scale, 0.0, 1.0 / x_scale;
    const Eigen::Matrix2d cov = t * cov_p * t.transpose();

    out.slope = p(1) / x_scale;
    out.intercept = p(0) - p(1) * x_mean / x_scale;
    out.intercept_stderr = std::sqrt(cov(0, 0));
    out.slope_stderr = std::sqrt(cov(1, 1));
    out.covariance = cov(0, 1);
    out.residual_std = std::sqrt(s2) * std::sqrt(w_max);  // in the caller's weights, not the rescaled ones
    out.r_squared = sst_w > 0.0 ? 1.0 - ssr_w / sst_w : 1.0;
    out.residual_rms = std::sqrt(ssr / static_cast<double>(n));
    return out;
}

}  // namespace tipgap
