// Minimal closed form needed by `method: simmons`; the full set of closed forms lands separately.
#include "tipgap/closed_forms.hpp"

#include <cmath>
#include <numbers>

#include "tipgap/constants.hpp"

namespace tipgap {

double simmons_intermediate(double phibar, double ds, double eV) {
    double A = 2.0 * ds * std::sqrt(2.0 * si::electron_mass) / si::hbar;
    double J0 = si::elementary_charge / (2.0 * std::numbers::pi * si::planck_h * ds * ds);
    return J0 * (phibar * std::exp(-A * std::sqrt(phibar)) - (phibar + eV) * std::exp(-A * std::sqrt(phibar + eV)));
}

}  // namespace tipgap
