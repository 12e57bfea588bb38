#include "tipgap/model/wkb.hpp"

#include <algorithm>
#include <cmath>

#include "model/detail/wkb_core.hpp"

namespace tipgap {

double wkb_exponent_concave(const std::function<double(double)>& U, const std::function<double(double)>& dU,
                            double lo, double hi, double E, double /*abs_tol*/) {
    // The contract allows U -> -inf at an end (an image pole at a surface). Evaluated exactly
    // there U and dU are infinite, which turns the bracketing root searches into NaN; move such
    // an end inward to the nearest point (in decades) where both are finite. The sliver cut off
    // is classically allowed (U far below E), so the exponent is unchanged.
    auto finite_end = [&](double end, double toward) {
        if (std::isfinite(U(end)) && std::isfinite(dU(end))) return end;
        for (double r = 1e-300; r < 1.0; r *= 1e10) {
            double x = end + (toward - end) * r;
            if (x != end && std::isfinite(U(x)) && std::isfinite(dU(x))) return x;
        }
        return end;
    };
    lo = finite_end(lo, hi);
    hi = finite_end(hi, lo);
    double xm = detail::concave_maximum(dU, lo, hi);
    if (U(xm) <= E) return 0.0;
    auto fdf = [&](double x) { return std::make_pair(U(x) - E, dU(x)); };
    double x1 = U(lo) >= E ? lo : detail::turning_point(fdf, 0.5 * (lo + xm), lo, xm);
    double x2 = U(hi) >= E ? hi : detail::turning_point(fdf, 0.5 * (xm + hi), xm, hi);
    auto f = [&](double x) { return U(x) - E; };
    return detail::wkb_prefactor() * detail::sqrt_integral(f, x1, std::clamp(xm, x1, x2), x2);
}

}  // namespace tipgap
