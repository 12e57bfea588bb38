#include "tipgap/wkb.hpp"

#include <algorithm>

#include "detail/wkb_core.hpp"

namespace tipgap {

double wkb_exponent_concave(const std::function<double(double)>& U, const std::function<double(double)>& dU,
                            double lo, double hi, double E, double /*abs_tol*/) {
    double xm = detail::concave_maximum(dU, lo, hi);
    if (U(xm) <= E) return 0.0;
    auto fdf = [&](double x) { return std::make_pair(U(x) - E, dU(x)); };
    double x1 = U(lo) >= E ? lo : detail::turning_point(fdf, 0.5 * (lo + xm), lo, xm);
    double x2 = U(hi) >= E ? hi : detail::turning_point(fdf, 0.5 * (xm + hi), xm, hi);
    auto f = [&](double x) { return U(x) - E; };
    return detail::wkb_prefactor() * detail::sqrt_integral(f, x1, std::clamp(xm, x1, x2), x2);
}

}  // namespace tipgap
