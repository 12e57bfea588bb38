// Exact T(E): Magnus transfer matrix over the clamped image barrier, Richardson-extrapolated.
#include "tipgap/model/exact_transmission.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <fmt/format.h>
#include <limits>
#include <numbers>

#include "model/detail/magnus_step.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap {
namespace {

// 2m/hbar^2 (1/(J m^2)).
constexpr double k2_per_J = 2.0 * si::electron_mass / (si::hbar * si::hbar);

// Level-0 mesh. With the image potential, steps are uniform in u = ln(x/(s - x)), so that a step is
// a fixed fraction of the distance to the nearer image pole (x(s - x)/s du): the potential's scale
// of variation. Without it U is linear and the steps are uniform in x. The probe halves both until
// the extrapolated ln T converges, so these only set where the doubling starts.
constexpr double kLogitStep = 0.5;       // level-0 step in u (common practice, no source)
constexpr double kLinearStep_m = 0.1e-9;  // level-0 step of a linear barrier (m)
constexpr int kMaxLevel = 10;             // 2^10 times the level-0 mesh: ~15,000 steps

// One Magnus step from x0 to x1 (sqrt(3)/6 offsets of the two Gauss points).
template <class U>
void push_step(std::vector<double>& h, std::vector<double>& c, std::vector<double>& ubar, const U& u, double x0,
               double x1) {
    const double step = x1 - x0, mid = 0.5 * (x0 + x1), off = step * std::numbers::sqrt3 / 6.0;
    const double u1 = u(mid - off), u2 = u(mid + off);
    h.push_back(step);
    c.push_back(std::numbers::sqrt3 / 12.0 * step * step * k2_per_J * (u1 - u2));
    ubar.push_back(0.5 * (u1 + u2));
}

}  // namespace

std::vector<exact_transmission::step> exact_transmission::build_mesh(int level) const {
    const barrier& b = potential_.raw();
    const double s = b.gap_m();
    const bool graded = b.image() != image_kind::none;
    std::vector<double> h, c, ubar;
    auto U = [&b](double x) { return b.potential_J(x); };
    for (const potential_piece& p : potential_.pieces()) {
        if (p.clamped) {
            h.push_back(p.hi_m - p.lo_m);
            c.push_back(0.0);
            ubar.push_back(p.value_J);
            continue;
        }
        if (graded) {
            const double ua = std::log(p.lo_m / (s - p.lo_m)), ub = std::log(p.hi_m / (s - p.hi_m));
            const int n = std::max(2, static_cast<int>(std::ceil((ub - ua) / kLogitStep))) << level;
            auto x_of = [&](int j) {
                if (j == 0) return p.lo_m;
                if (j == n) return p.hi_m;
                return s / (1.0 + std::exp(-(ua + (ub - ua) * j / n)));
            };
            for (int j = 0; j < n; ++j) push_step(h, c, ubar, U, x_of(j), x_of(j + 1));
        } else {
            const int n = std::max(2, static_cast<int>(std::ceil((p.hi_m - p.lo_m) / kLinearStep_m))) << level;
            for (int j = 0; j < n; ++j) {
                const double x0 = p.lo_m + (p.hi_m - p.lo_m) * j / n;
                const double x1 = j + 1 == n ? p.hi_m : p.lo_m + (p.hi_m - p.lo_m) * (j + 1) / n;
                push_step(h, c, ubar, U, x0, x1);
            }
        }
    }
    std::vector<step> mesh(h.size());
    for (std::size_t i = 0; i < h.size(); ++i) mesh[i] = {h[i], c[i], ubar[i]};
    return mesh;
}

double exact_transmission::tip_wavenumber(double E) const {
    return std::sqrt(std::max(0.0, k2_per_J * (E + ef_t_)));
}

double exact_transmission::sample_wavenumber(double E) const {
    return std::sqrt(std::max(0.0, k2_per_J * (E + ef_s_eV_)));
}

// ln[T/(k_t k_s)] on one mesh. With M the transfer matrix of (psi, psi') from x = 0 to x = s, a unit
// wave from the tip gives T = 4 k_t k_s / D,  D = (k_t M22 + k_s M11)^2 + (M21 - k_t k_s M12)^2
// (matching psi = e^{i k_t x} + r e^{-i k_t x} at 0 and t e^{i k_s x} at s, det M = 1): a sum of
// squares, so nothing cancels however thick the barrier.
double exact_transmission::log_reduced_on(const std::vector<step>& mesh, double E) const {
    detail::transfer_matrix M;
    const double ref_k = 1e10;  // a typical electron wavenumber (1/m), only weighs the renormalisation
    for (const step& st : mesh) {
        detail::magnus_step(M, st.h, st.c, k2_per_J * (st.ubar - E) * st.h);
        detail::renormalise(M, ref_k);
    }
    const double kt = tip_wavenumber(E), ks = sample_wavenumber(E);
    const double a = kt * M.m22 + ks * M.m11, b = M.m21 - kt * ks * M.m12;
    return std::log(4.0) - std::log(a * a + b * b) - 2.0 * M.log_scale;
}

// Mesh choice: levels L, L+1, L+2 at the ends and middle of the energy range; the Richardson value
// of (L, L+1) is accepted when it agrees with that of (L+1, L+2) to rel_tol (an error in ln T is a
// relative error in T). The sixth-order remainder makes the (L+1, L+2) value ~64x closer.
void exact_transmission::choose_mesh(double lowest, double highest, double rel_tol) {
    const std::array<double, 3> probes{lowest, 0.5 * (lowest + highest), highest};
    std::vector<std::vector<step>> meshes;
    std::vector<std::array<double, 3>> g;
    auto level = [&](int L) {
        while (static_cast<int>(meshes.size()) <= L) {
            meshes.push_back(build_mesh(static_cast<int>(meshes.size())));
            std::array<double, 3> row{};
            for (std::size_t i = 0; i < probes.size(); ++i) row[i] = log_reduced_on(meshes.back(), probes[i]);
            g.push_back(row);
        }
    };
    auto richardson = [](double coarse, double fine) { return fine + (fine - coarse) / 15.0; };
    for (int L = 0;; ++L) {
        level(L + 2);
        double err = 0.0;
        for (std::size_t i = 0; i < probes.size(); ++i) {
            const double a = richardson(g[L][i], g[L + 1][i]), b = richardson(g[L + 1][i], g[L + 2][i]);
            err = std::max(err, std::abs(a - b));
        }
        if (err <= rel_tol || L + 2 >= kMaxLevel) {
            coarse_ = std::move(meshes[L]);
            fine_ = std::move(meshes[L + 1]);
            error_ = err;
            return;
        }
    }
}

exact_transmission::exact_transmission(const model_options& o, double s, double V, double lowest, double highest,
                                       double rel_tol)
    : potential_(o, s, V),
      ef_t_(o.tip.fermi_energy_J),
      ef_s_eV_(si::elementary_charge * V + o.sample.fermi_energy_J) {
    location where;
    if (!(rel_tol >= 1e-13 && rel_tol <= 1e-2)) {
        where.key = "tolerance";
        throw_input(where, fmt::format("{:g} is out of range; expected a relative tolerance in [1e-13, 1e-2]", rel_tol));
    }
    if (!(highest > lowest && std::isfinite(lowest) && std::isfinite(highest))) {
        where.key = "energy";
        throw_input(where, fmt::format("energy range [{:g}, {:g}] eV is empty", lowest / si::electron_volt,
                                       highest / si::electron_volt));
    }
    choose_mesh(lowest, highest, rel_tol);
}

namespace {
struct energy_range {
    double lowest, highest;
};
// The energies that carry current at low temperature: from just above the higher band bottom to the
// higher Fermi level (at least 1 eV wide).
energy_range default_range(const model_options& o, double V) {
    const double eV = si::elementary_charge * V;
    const double bottom = std::max(-o.tip.fermi_energy_J, -eV - o.sample.fermi_energy_J);
    const double lowest = bottom + 1e-3 * si::electron_volt;
    return {lowest, std::max(std::max(0.0, -eV), lowest + si::electron_volt)};
}
}  // namespace

exact_transmission::exact_transmission(const model_options& o, double s, double V, double rel_tol)
    : exact_transmission(o, s, V, default_range(o, V).lowest, default_range(o, V).highest, rel_tol) {}

double exact_transmission::log_reduced_transmission(double E) const {
    const double coarse = log_reduced_on(coarse_, E), fine = log_reduced_on(fine_, E);
    return fine + (fine - coarse) / 15.0;
}

double exact_transmission::log_transmission(double E) const {
    const double kt = tip_wavenumber(E), ks = sample_wavenumber(E);
    if (kt == 0.0 || ks == 0.0) return -std::numeric_limits<double>::infinity();
    return log_reduced_transmission(E) + std::log(kt) + std::log(ks);
}

double exact_transmission::transmission(double E) const { return std::exp(log_transmission(E)); }

}  // namespace tipgap
