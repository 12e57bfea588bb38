#include "tipgap/model/transmission.hpp"

#include <algorithm>
#include <cmath>

#include "model/detail/wkb_core.hpp"

namespace tipgap {

double wkb_exponent(const barrier& b, double E, double abs_tol) {
    double x1 = 0, x2 = 0;
    if (!b.forbidden_interval(E, x1, x2)) return 0.0;
    if (b.image() == image_kind::none) {
        // Linear U: the closed form of ∫ sqrt(U - E) dx.
        double u1 = std::max(0.0, b.potential_J(x1) - E), u2 = std::max(0.0, b.potential_J(x2) - E);
        if (u1 + u2 == 0.0) return 0.0;
        return detail::wkb_prefactor() * detail::trapezoid_sqrt_integral(u1, u2, x2 - x1);
    }
    auto f = [&b, E](double x) { return b.potential_J(x) - E; };
    double xm = std::clamp(b.top_x_m(), x1, x2);
    double integral = abs_tol >= 1e-7 ? detail::sqrt_integral<20>(f, x1, xm, x2) : detail::sqrt_integral<30>(f, x1, xm, x2);
    return detail::wkb_prefactor() * integral;
}

double wkb_transmission(const barrier& b, double E, double abs_tol) { return std::exp(-wkb_exponent(b, E, abs_tol)); }

}  // namespace tipgap
