#include <algorithm>
#include <cmath>

#include "tipgap/model/current.hpp"

namespace tipgap {

double supply_function(double E, double eV, double kT) {
    if (kT <= 0.0) {
        if (E <= std::min(0.0, -eV)) return eV;  // below both Fermi levels: exactly eV
        if (E >= std::max(0.0, -eV)) return 0.0;
        return std::max(0.0, -E) - std::max(0.0, -E - eV);
    }
    // kT [softplus(a) - softplus(b)], a = -E/kT, b = -(E+eV)/kT, softplus(y) = ln(1 + e^y)
    // = max(y, 0) + log1p(e^-|y|). The linear parts are taken as eV/kT when both are positive so that
    // deep below the Fermi levels (|a| ~ 1e4 at 4 K) nothing cancels.
    double a = -E / kT, b = -(E + eV) / kT;
    // Far from both edges the log1p terms are below 1e-16 of the result.
    if (a > 40.0 && b > 40.0) return eV;
    if (a < -40.0 && b < -40.0) return kT * (std::exp(a) - std::exp(b));
    double lin;
    if (a > 0.0 && b > 0.0) {
        lin = eV / kT;
    } else {
        lin = std::max(a, 0.0) - std::max(b, 0.0);
    }
    // ln(1 + e^-|y|) is exactly 0 in double once e^-|y| underflows to 0 (|y| > 745.2); returning it
    // directly skips libm's slow underflow path, which deep below a Fermi edge at low temperature
    // (|y| ~ 1e4) is taken at most energy nodes.
    auto tail = [](double y) { return std::abs(y) > 746.0 ? 0.0 : std::log1p(std::exp(-std::abs(y))); };
    return kT * (lin + tail(a) - tail(b));
}

}  // namespace tipgap
