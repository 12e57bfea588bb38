#include "tipgap/model/current.hpp"

#include <algorithm>
#include <boost/math/quadrature/gauss.hpp>
#include <cmath>

#include "model/detail/energy_integral.hpp"
#include "tipgap/model/barrier.hpp"
#include "tipgap/model/closed_forms.hpp"
#include "tipgap/model/exact_transmission.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/transmission.hpp"

namespace tipgap {
namespace {

double wkb_current_density(const model_options& o, double s, double V) {
    return detail::wkb_energy_integral(o, s, V, 1, detail::energy_weight::current).value;
}

// Mean barrier height above energy E over the forbidden interval, and its width (Simmons' phibar, ds).
bool mean_barrier(const barrier& b, double E, double& phibar, double& width) {
    double x1 = 0, x2 = 0;
    if (!b.forbidden_interval(E, x1, x2) || !(x2 > x1)) return false;
    using rule = boost::math::quadrature::gauss<double, 30>;
    auto f = [&](double x) { return b.potential_J(x) - E; };
    double xm = std::clamp(b.top_x_m(), x1, x2);
    double area = rule::integrate(f, x1, xm) + rule::integrate(f, xm, x2);
    width = x2 - x1;
    phibar = area / width;
    return phibar > 0.0;
}

double simmons_current_density(const model_options& o, double s, double V) {
    if (V == 0.0) return 0.0;
    barrier b(o, s, V);
    const double eV = si::elementary_charge * V;
    const double e_emit = std::max(0.0, -eV);
    double phibar = 0, width = 0;
    // Collapsed barrier: Simmons' formula has no meaning; the numerical model is used instead.
    if (!mean_barrier(b, e_emit, phibar, width)) return wkb_current_density(o, s, V);
    // The formula is J0 [f(phibar) - f(phibar + eV)] with f(x) = x exp(-A sqrt(x)), which falls with
    // x (so J > 0 for every V > 0) only while A sqrt(phibar) >= 2, i.e. the barrier is at least
    // about one decay length thick. A thinner or lower barrier is outside the formula's validity
    // (it would give a current against the bias), so the numerical model is used there too.
    const double A = 2.0 * width * std::sqrt(2.0 * si::electron_mass) / si::hbar;
    if (A * std::sqrt(phibar) < 2.0) return wkb_current_density(o, s, V);
    double j = simmons_intermediate(phibar, width, std::abs(eV));
    return V > 0 ? j : -j;
}

}  // namespace

double current_density(const model_options& o, double gap_m, double bias_V) {
    switch (o.method) {
        case method_kind::simmons: return simmons_current_density(o, gap_m, bias_V);
        case method_kind::exact: return exact_current_density(o, gap_m, bias_V);
        case method_kind::wkb: break;
    }
    return wkb_current_density(o, gap_m, bias_V);
}

regime classify(const model_options& o, double s, double V, double* top_J, double* width_m) {
    barrier b(o, s, V);
    const double eV = si::elementary_charge * V;
    const double e_emit = std::max(0.0, -eV);
    double x1 = 0, x2 = 0;
    bool has = b.forbidden_interval(e_emit, x1, x2);
    if (top_J) *top_J = b.top_J() - e_emit;
    if (width_m) *width_m = has ? x2 - x1 : 0.0;
    if (!has) return regime::barrier_collapsed;
    // The collector-side corner of the image-free trapezoid below the emitting Fermi level: the
    // barrier is triangular (Fowler-Nordheim regime).
    double collector_corner = V >= 0 ? o.sample.work_function_J - eV : o.tip.work_function_J;
    return collector_corner < e_emit ? regime::field_emission : regime::direct_tunnelling;
}

}  // namespace tipgap
