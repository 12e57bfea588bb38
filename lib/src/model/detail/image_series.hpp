#pragma once
// The exact image series between two grounded planes, g(a) = 2 gamma + psi(a) + psi(1 - a),
// a = x/s in (0, 1), so that W(x) = e^2/(16 pi eps0 K s) g(x/s).
// Fast path: g(a) = h(a) - 1/a - 1/(1 - a) with h(a) = 2 gamma + psi(1 + a) + psi(2 - a) smooth on
// [0, 1] (nearest poles at a = -1 and a = 2), held as a Chebyshev series fitted once to Boost.Math's
// digamma; max error below 1e-15 on [0, 1] (checked in tests/image_potential_test.cpp).

namespace tipgap::detail {

// g(a) from Boost.Math digamma directly (reference, slow). a in (0, 1).
double image_g_reference(double a);
// g(a) and g'(a) from the Chebyshev representation. a in (0, 1).
double image_g(double a);
double image_g_prime(double a);

}  // namespace tipgap::detail
