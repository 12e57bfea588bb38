#include "tipgap/model/barrier.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "model/detail/image_series.hpp"
#include "model/detail/wkb_core.hpp"
#include "tipgap/core/constants.hpp"

namespace tipgap {
namespace {
// Simmons' 1.15 ln 2 / 4: W = -(1.15 ln2 / 4) (e^2/(4 pi eps0 K)) s / (x (s - x)).
const double simmons_coeff = 1.15 * std::numbers::ln2 / 4.0;
}  // namespace

double image_potential_exact(double x, double s, double K) {
    return si::coulomb_e2 / (4.0 * K * s) * detail::image_g(x / s);
}

double image_potential_approximate(double x, double s, double K) {
    return -simmons_coeff * si::coulomb_e2 / K * s / (x * (s - x));
}

barrier::barrier(const model_options& o, double gap_m, double bias_V)
    : s_(gap_m),
      bias_(bias_V),
      phi_t_(o.tip.work_function_J),
      slope_lin_((o.sample.work_function_J - si::elementary_charge * bias_V - o.tip.work_function_J) / gap_m),
      K_(o.relative_permittivity),
      image_scale_(o.image == image_kind::exact ? si::coulomb_e2 / (4.0 * o.relative_permittivity * gap_m)
                                                : simmons_coeff * si::coulomb_e2 / o.relative_permittivity),
      image_(o.image) {
    const double eV = si::elementary_charge * bias_V;
    band_bottom_ = std::max(-o.tip.fermi_energy_J, -eV - o.sample.fermi_energy_J);
    if (image_ == image_kind::none) {
        double u0 = phi_t_, us = phi_t_ + slope_lin_ * s_;
        top_x_ = u0 >= us ? 0.0 : s_;
        top_J_ = std::max(u0, us);
    } else {
        auto dU = [this](double x) { return slope_J_per_m(x); };
        top_x_ = detail::concave_maximum(dU, s_ * 1e-9, s_ * (1.0 - 1e-9));
        top_J_ = potential_J(top_x_);
    }
}

double barrier::image_J(double x) const {
    switch (image_) {
        case image_kind::none: return 0.0;
        case image_kind::exact: return image_scale_ * detail::image_g(x / s_);
        case image_kind::approximate: return -image_scale_ * s_ / (x * (s_ - x));
    }
    return 0.0;
}

double barrier::image_slope(double x) const {
    switch (image_) {
        case image_kind::none: return 0.0;
        case image_kind::exact: return image_scale_ / s_ * detail::image_g_prime(x / s_);
        case image_kind::approximate: {
            double d = x * (s_ - x);
            return image_scale_ * s_ * (s_ - 2.0 * x) / (d * d);
        }
    }
    return 0.0;
}

double barrier::potential_J(double x) const { return phi_t_ + slope_lin_ * x + image_J(x); }

double barrier::slope_J_per_m(double x) const { return slope_lin_ + image_slope(x); }

bool barrier::forbidden_interval(double E, double& x1, double& x2) const {
    if (E >= top_J_) return false;
    if (image_ == image_kind::none) {
        double u0 = phi_t_, us = phi_t_ + slope_lin_ * s_;
        x1 = u0 > E ? 0.0 : (E - phi_t_) / slope_lin_;
        x2 = us > E ? s_ : (E - phi_t_) / slope_lin_;
        x1 = std::clamp(x1, 0.0, s_);
        x2 = std::clamp(x2, x1, s_);
        return true;
    }
    auto fdf = [this, E](double x) { return std::make_pair(potential_J(x) - E, slope_J_per_m(x)); };
    // Near an electrode U ~ U_lin - c/x, which gives a close first guess for the turning point.
    const double c_near = image_ == image_kind::exact ? si::coulomb_e2 / (4.0 * K_) : image_scale_;
    double lo = s_ * 1e-12, hi = s_ * (1.0 - 1e-12);
    // Keeping the linear term too, U - E ~ d + k y - c/y at a distance y from an electrode, whose
    // root y = 2c / (d + sqrt(d^2 + 4kc)) is within O((y/s)^2) of the turning point: Newton then
    // needs about half the steps it needs from c/d.
    auto near_root = [c_near](double d, double k) {
        const double disc = d * d + 4.0 * k * c_near;
        return d > 0 && disc >= 0 ? 2.0 * c_near / (d + std::sqrt(disc)) : -1.0;
    };
    double us = phi_t_ + slope_lin_ * s_;
    double y1 = near_root(phi_t_ - E, slope_lin_), y2 = near_root(us - E, -slope_lin_);
    double g1 = y1 > 0 ? y1 : 0.5 * top_x_;
    double g2 = y2 > 0 ? s_ - y2 : 0.5 * (top_x_ + s_);
    x1 = detail::turning_point(fdf, std::min(g1, 0.999 * top_x_), lo, top_x_);
    x2 = detail::turning_point(fdf, std::max(g2, top_x_ + 0.001 * (s_ - top_x_)), top_x_, hi);
    return true;
}

}  // namespace tipgap
