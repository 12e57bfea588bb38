#pragma once
// Generic WKB exponent for any concave one-dimensional barrier, used by the planar model and by
// cross-checks against published closed forms (Schottky-Nordheim barrier).
#include <functional>

namespace tipgap {

// Returns (2/hbar) ∫ sqrt(2 m_e (U(x) - E)) dx over the single interval where U(x) > E.
// U: potential energy (J) of position x (m), concave on (lo_m, hi_m) (it may tend to -inf at an
//    end, or stay finite there, in which case the interval may end at lo_m or hi_m);
// dU: dU/dx (J/m); lo_m < hi_m: the domain (m); E_J: energy (J);
// abs_tol: absolute accuracy of the returned exponent (>= 1e-14). Returns 0 when U <= E everywhere.
double wkb_exponent_concave(const std::function<double(double)>& U, const std::function<double(double)>& dU,
                            double lo_m, double hi_m, double E_J, double abs_tol = 1e-10);

}  // namespace tipgap
