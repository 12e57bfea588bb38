// J from the exact transmission: ln[T/(k_t k_s)] tabulated on adaptive Chebyshev pieces, then the
// Tsu-Esaki integral of `wkb` on the table.
#include <algorithm>
#include <cmath>
#include <vector>

#include "model/detail/energy_quadrature.hpp"
#include "model/detail/piecewise_chebyshev.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/exact_transmission.hpp"

namespace tipgap {

// Why a table, and why in w = sqrt(E - E_bottom): T(E) does not depend on the supply function, so it
// is sampled once per (gap, bias) and the quadrature, which needs ~15 nodes on each of the ~10
// pieces the Fermi edges cut the window into, runs on the interpolant. T vanishes at the higher band
// bottom as k_t k_s, i.e. like sqrt(E - E_bottom); ln[T/(k_t k_s)] is analytic in E there but its
// factor k is not, while in w both are (k = sqrt(2m) w/hbar). Below the barrier top the table is
// one piece of 17-33 nodes (ln T is nearly linear in E); above the sample's vacuum level T(E) has
// field-emission resonances (standing waves between the barrier and the sample surface, widths of
// tens of meV), which the adaptive pieces resolve: they are halved until each piece's Chebyshev
// tail is below the tolerance, so a resonance gets pieces of its own width.
double exact_current_density(const model_options& o, double s, double V) {
    constexpr double J_per_eV = si::electron_volt;
    const double eV = si::elementary_charge * V;
    const double kT = si::boltzmann_k * o.temperature_K;
    const double bottom = std::max(-o.tip.fermi_energy_J, -eV - o.sample.fermi_energy_J);
    const detail::energy_window w = detail::tsu_esaki_window(bottom, eV, kT);
    if (w.empty()) return 0.0;
    // Error budget: 0.1 rel_tol each for T, for the table and for the quadrature.
    const double tol = 0.1 * o.rel_tol;
    const exact_transmission t(o, s, V, w.e_lo, w.e_up, tol);
    auto g = [&](double u) { return t.log_reduced_transmission(w.e_lo + u * u * J_per_eV); };
    const double u_up = std::sqrt((w.e_up - w.e_lo) / J_per_eV);
    auto piece_tol = [tol](const std::vector<double>&, double, double) { return tol; };
    // 1e-7 of the window in w is 1e-14 of it in E: far below any resonance width.
    const detail::piecewise_chebyshev table(g, 0.0, u_up, piece_tol, 1e-7 * u_up);
    auto transmission = [&](double E) {
        const double u = std::sqrt(std::max(0.0, (E - w.e_lo) / J_per_eV));
        return t.tip_wavenumber(E) * t.sample_wavenumber(E) * std::exp(table(u));
    };
    // The table's piece ends are where T(E) changes character fastest: cut the quadrature there too.
    std::vector<double> cuts;
    for (double u : table.breaks()) cuts.push_back(w.e_lo + u * u * J_per_eV);
    return detail::tsu_esaki_integral(transmission, w, cuts, tol);
}

}  // namespace tipgap
