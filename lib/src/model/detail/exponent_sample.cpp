#include "model/detail/exponent_sample.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "model/detail/wkb_core.hpp"
#include "tipgap/core/constants.hpp"

namespace tipgap::detail {
namespace {

// The derivatives from theta and the moments I0, I1 (formulas in the header).
exponent_sample from_moments(const barrier& b, double E, double theta, double I0, double I1) {
    const double p = wkb_prefactor(), s = b.gap_m();
    exponent_sample out;
    out.theta = theta;
    out.d_ds_per_m = 0.5 * theta / s + 0.5 * p / s * ((b.tip_work_function_J() - E) * I0 + b.linear_slope_J_per_m() * I1);
    out.d_dV_per_V = -0.5 * p * si::elementary_charge / s * I1;
    return out;
}

// Linear U - E from u1 at x1 to u2 at x2 (r = sqrt(u)): I0 = 2 L / (r1 + r2) and, with y = x - x1,
// ∫ y dy / sqrt(u) = (2 L^2 / 3) (r2 + 2 r1) / (r1 + r2)^2 (substitute r = sqrt(u); derived here),
// both stable for u1 = u2.
exponent_sample trapezoid_sample(const barrier& b, double E, double x1, double x2) {
    double u1 = std::max(0.0, b.potential_J(x1) - E), u2 = std::max(0.0, b.potential_J(x2) - E);
    if (u1 + u2 == 0.0) return {};
    const double L = x2 - x1, r1 = std::sqrt(u1), r2 = std::sqrt(u2), rs = r1 + r2;
    const double theta = wkb_prefactor() * trapezoid_sqrt_integral(u1, u2, L);
    const double I0 = 2.0 * L / rs;
    const double I1 = x1 * I0 + (2.0 / 3.0) * L * L * (r2 + 2.0 * r1) / (rs * rs);
    exponent_sample out = from_moments(b, E, theta, I0, I1);
    out.d_ds_per_m = theta / b.gap_m();  // exact for a trapezoid; the general form agrees to rounding
    return out;
}

}  // namespace

exponent_sample wkb_exponent_sample(const barrier& b, double E, double abs_tol) {
    double x1 = 0, x2 = 0;
    if (!b.forbidden_interval(E, x1, x2)) return {};
    if (b.image() == image_kind::none) return trapezoid_sample(b, E, x1, x2);
    auto f = [&b, E](double x) { return b.potential_J(x) - E; };
    const double xm = std::clamp(b.top_x_m(), x1, x2);
    // The rule choice follows wkb_exponent so that theta is the same number.
    const sqrt_moments m = abs_tol >= 1e-7 ? sqrt_integral_moments<20>(f, x1, xm, x2)
                                           : sqrt_integral_moments<30>(f, x1, xm, x2);
    return from_moments(b, E, wkb_prefactor() * m.root, m.inverse_root, m.x_over_root);
}

exponent_sample wkb_exponent_at_top(const barrier& b) {
    const double xm = b.top_x_m(), s = b.gap_m();
    // U'' by a central difference of the analytic slope: the step keeps both the O(h^2) error and
    // the rounding of the difference near 1e-9 relative (U' is smooth this far from the poles).
    const double h = 1e-4 * std::min(xm, s - xm);
    const double curvature = -(b.slope_J_per_m(xm + h) - b.slope_J_per_m(xm - h)) / (2.0 * h);
    if (!(curvature > 0.0)) return {};
    const double I0 = std::numbers::pi * std::sqrt(2.0 / curvature);
    return from_moments(b, b.top_J(), 0.0, I0, xm * I0);
}

}  // namespace tipgap::detail
