#pragma once
// The Tsu-Esaki energy integral of the WKB model (Tsu & Esaki 1973, Appl. Phys. Lett. 22, 562),
// J = (4 pi m e / h^3) ∫ D(E) N(E) dE, and in the same pass its derivatives with respect to the gap
// and the bias: the integrands d/ds [D N] = -theta_s D N and d/dV [D N] = D (N_V - theta_V N) are
// smooth on the same pieces as D N (the barrier top, where theta_s and theta_V jump to zero, is
// already a breakpoint), so one adaptive Gauss-Kronrod pass serves all of them.
#include "tipgap/model/model.hpp"

namespace tipgap::detail {

enum class energy_weight {
    current,                // N(E): J and its derivatives
    zero_bias_conductance,  // dN/dV at V = 0, e f(E): G = dJ/dV(0) and its gap derivative
};

struct energy_integral {
    double value = 0;  // J (A/m^2) or G (S/m^2)
    double d_ds = 0;   // d value / ds at fixed V (per m); 0 when not asked for
    double d_dV = 0;   // dJ/dV at fixed s (S/m^2), weight current only; 0 when not asked for
};

// components: 1 (value only; bitwise the planar WKB current of the previous releases), 2 (and
// d/ds), 3 (and d/dV; weight current only). The value is the same number for every component count.
// Method wkb; o validated; gap_m > 0.
energy_integral wkb_energy_integral(const model_options& o, double gap_m, double bias_V, int components,
                                   energy_weight weight);

}  // namespace tipgap::detail
