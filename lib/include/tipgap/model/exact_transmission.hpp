#pragma once
// Exact transmission (`method: exact`): the one-dimensional Schrödinger equation through the planar
// barrier, with plane waves in the electrodes, and the current density from it.
//
// Electrodes: free electrons (mass m_e) with flat band bottoms -E_F,tip for x < 0 and
// -eV - E_F,sample for x > s (energies from the tip Fermi level, V the sample bias). For a normal
// energy E above both band bottoms, with k_t = sqrt(2m (E + E_F,tip))/hbar and
// k_s = sqrt(2m (E + eV + E_F,sample))/hbar, the transmission is T(E) = (k_s/k_t) |t|^2, t the
// transmitted amplitude of a unit wave incident from the tip. T is the same for either direction,
// so the Tsu-Esaki integral J = (4 pi m e/h^3) ∫ T(E) N(E) dE (Tsu & Esaki 1973, Appl. Phys. Lett.
// 22, 562) takes it with the supply function of `wkb`.
//
// Surface potential. The classical image potential diverges at both surfaces; a wave equation needs
// a finite potential. The default model (surface_model::clamp): wherever the image-lowered barrier
// U(x) of tipgap/model/barrier.hpp falls below the band bottom of the nearer electrode, the
// potential is that band bottom:
//   U_eff(x) = max(U(x), -E_F,tip)             for x < s/2,
//   U_eff(x) = max(U(x), -eV - E_F,sample)     for x > s/2.
// The electron then meets the electrode where the image attraction has pulled the barrier down to
// the bottom of the conduction band, and the potential is continuous there. This is the simplest
// finite completion of the classical image potential; it ignores the smooth saturation inside the
// surface that self-consistent surface calculations give, so resonance positions carry an
// uncertainty of order the image-plane position (~0.1 nm) times the field.
//
// Numerical method (lib/src/model/exact_transmission.cpp): the real 2x2 transfer matrix of
// (psi, psi') over [0, s], built from fourth-order Magnus steps (two Gauss points per step, exact
// 2x2 matrix exponential; lib/src/model/detail/magnus_step.hpp) on a mesh graded
// towards the image poles, with Richardson extrapolation of ln T between the mesh and its halving.
// Clamped stretches are single exact constant-potential steps. T is formed as a sum of squares of
// the matrix entries (no cancellation) with the matrix renormalised as it grows, so ln T stays
// accurate for barriers far thicker than T's double range.
#include <vector>

#include "tipgap/model/barrier.hpp"
#include "tipgap/model/model.hpp"

namespace tipgap {

// One stretch of the effective potential on [lo_m, hi_m]: either the smooth barrier U(x) or a
// constant (a band bottom where the image-lowered barrier dips below it).
struct potential_piece {
    double lo_m = 0, hi_m = 0;  // ends (m), 0 <= lo_m < hi_m <= s
    bool clamped = false;       // true: U_eff = value_J on the piece
    double value_J = 0;         // the band bottom (J) when clamped
};

// The finite potential the exact solver uses (see the surface model above).
class surface_potential {
public:
    // options: junction (validated); gap_m: s (m), > 0; bias_V: sample bias (V).
    surface_potential(const model_options& options, double gap_m, double bias_V);

    // U_eff(x) in J, 0 <= x <= s.
    double potential_J(double x_m) const;
    // Band bottoms (J): -E_F,tip and -eV - E_F,sample.
    double tip_band_bottom_J() const { return tip_bottom_; }
    double sample_band_bottom_J() const { return sample_bottom_; }
    // The pieces, in order from x = 0 to x = s.
    const std::vector<potential_piece>& pieces() const { return pieces_; }
    // The image-lowered barrier U(x) (unclamped).
    const barrier& raw() const { return raw_; }

private:
    barrier raw_;
    double tip_bottom_, sample_bottom_;
    std::vector<potential_piece> pieces_;
};

// T(E) of one (gap, bias) point. Construction chooses the Magnus mesh for the whole energy range
// [lowest_J, highest_J] (the probe evaluates T on successively halved meshes at both ends of it
// until the Richardson-extrapolated ln T agrees to rel_tol); each evaluation then costs about
// 3 x (steps) matrix exponentials.
class exact_transmission {
public:
    // options: junction (validated); gap_m: s (m), > 0; bias_V: sample bias (V);
    // lowest_J < highest_J: energy range the mesh is checked on (J, from the tip Fermi level),
    // lowest_J above both band bottoms; rel_tol: relative accuracy of T, [1e-13, 1e-2].
    // Throws tipgap::error (input, key "tolerance" / "energy") for a rel_tol out of range or an
    // empty energy range.
    exact_transmission(const model_options& options, double gap_m, double bias_V, double lowest_J, double highest_J,
                       double rel_tol);
    // Same, with the mesh checked over [max band bottom + 1 meV, 0] and [-eV, 0].
    exact_transmission(const model_options& options, double gap_m, double bias_V, double rel_tol);

    // T(E), E_J (J) above both band bottoms (0 at or below the higher one).
    double transmission(double E_J) const;
    // ln T(E); finite where T underflows (barriers of tens of nm). -inf at or below the band bottom.
    double log_transmission(double E_J) const;
    // ln[T(E) / (k_t k_s)] with k in 1/m: the part of T that is analytic in E at the band bottoms
    // (T vanishes there as k_t k_s). Defined for E at or above the higher band bottom.
    double log_reduced_transmission(double E_J) const;
    // Wavenumbers (1/m) in the tip and the sample at E_J (0 below the band bottom).
    double tip_wavenumber(double E_J) const;
    double sample_wavenumber(double E_J) const;

    const surface_potential& potential() const { return potential_; }
    // Magnus steps of the coarser of the two meshes (the cost of one evaluation is ~3x this).
    int steps() const { return static_cast<int>(coarse_.size()); }
    // Estimated relative error of T from the mesh probe (<= rel_tol unless the mesh limit was hit).
    double error_estimate() const { return error_; }

private:
    struct step {
        double h = 0;     // step length (m)
        double c = 0;     // Magnus commutator term, sqrt(3)/12 h^2 (2m/hbar^2)(U1 - U2), dimensionless
        double ubar = 0;  // mean of U at the two Gauss points (J)
    };
    std::vector<step> build_mesh(int level) const;
    double log_reduced_on(const std::vector<step>& mesh, double E) const;
    void choose_mesh(double lowest, double highest, double rel_tol);
    surface_potential potential_;
    double ef_t_, ef_s_eV_;  // E_F,tip and eV + E_F,sample (J)
    std::vector<step> coarse_, fine_;
    double error_ = 0;
};

// Current density J (A/m^2) with the sign of the bias from the exact transmission. The energy
// integral is the Tsu-Esaki integral of `wkb`; ln[T/(k_t k_s)] is tabulated on adaptive piecewise
// Chebyshev pieces in w = sqrt(E - E_bottom) (T is analytic in w), which resolves field-emission
// resonances without evaluating T at every quadrature node.
// gap_m: s (m), > 0; bias_V: sample bias (V); relative accuracy options.rel_tol.
double exact_current_density(const model_options& options, double gap_m, double bias_V);

}  // namespace tipgap
