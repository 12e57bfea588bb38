#pragma once
// WKB transmission through a barrier: D(E) = exp(-(2/hbar) ∫ sqrt(2m (U(x) - E)) dx) over the
// classically forbidden interval, D = 1 above the barrier top.
#include "tipgap/model/barrier.hpp"

namespace tipgap {

// WKB exponent (dimensionless, >= 0) at normal energy E_J (J, from the tip Fermi level).
// abs_tol: absolute accuracy of the exponent (>= 1e-14).
double wkb_exponent(const barrier& b, double E_J, double abs_tol = 1e-9);

// D(E) = exp(-wkb_exponent).
double wkb_transmission(const barrier& b, double E_J, double abs_tol = 1e-9);

}  // namespace tipgap
