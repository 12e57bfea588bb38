#pragma once
// The potential-energy barrier between tip (x = 0) and sample (x = s) at sample bias V.
// Energies are measured from the tip Fermi level; the sample Fermi level sits at -eV.
// U(x) = phi_t + (phi_s - eV - phi_t) x/s + U_image(x)          (all in J)
#include "tipgap/model/model.hpp"

namespace tipgap {

// Exact image potential of an electron between two grounded planes a distance s apart in a
// medium of relative permittivity K (method of images, summed with digamma functions):
//   W(x) = e^2/(16 pi eps0 K s) [2 gamma + psi(x/s) + psi(1 - x/s)].
// x: position (m), 0 < x < s; s: gap (m), > 0; K: relative permittivity, >= 1. Returns J (< 0).
double image_potential_exact(double x, double s, double K);

// Simmons 1963 (J. Appl. Phys. 34, 1793, eq. 33) approximate image potential
//   W(x) = -1.15 lambda s^2 / (x (s - x)),  lambda = e^2 ln2 / (16 pi eps0 K s)  (SI reading).
// Same arguments and units as image_potential_exact.
double image_potential_approximate(double x, double s, double K);

class barrier {
public:
    // options: junction (validated); gap_m: tip-sample distance s (m), > 0; bias_V: sample bias (V).
    barrier(const model_options& options, double gap_m, double bias_V);

    double gap_m() const { return s_; }
    double bias_V() const { return bias_; }
    image_kind image() const { return image_; }

    // U(x) in J for 0 < x < s (at the ends only for image_kind::none).
    double potential_J(double x_m) const;
    // dU/dx in J/m.
    double slope_J_per_m(double x_m) const;

    // Barrier maximum: value (J) and position (m).
    double top_J() const { return top_J_; }
    double top_x_m() const { return top_x_; }

    // Classically forbidden interval {x : U(x) > E}; false when E >= top (no barrier).
    // For image_kind::none the interval may end at 0 or s.
    bool forbidden_interval(double E_J, double& x1_m, double& x2_m) const;

    // Lowest energy that carries current: the higher of the two band bottoms (J).
    double band_bottom_J() const { return band_bottom_; }

    // The image-free part of U: phi_t + k x with k = (phi_s - eV - phi_t) / s. U minus this is the
    // image term alone, which the gap derivative of the WKB exponent needs.
    double tip_work_function_J() const { return phi_t_; }
    double linear_slope_J_per_m() const { return slope_lin_; }

private:
    double image_J(double x) const;
    double image_slope(double x) const;
    double s_, bias_, phi_t_, slope_lin_, K_, image_scale_;
    image_kind image_;
    double top_J_ = 0, top_x_ = 0, band_bottom_ = 0;
};

}  // namespace tipgap
