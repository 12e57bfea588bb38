#include "tipgap/model/geometry.hpp"

#include <boost/math/quadrature/gauss_kronrod.hpp>
#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <numbers>

#include "model/detail/paraboloid_current.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/current.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap {

void geometry_options::validate() const {
    auto bad = [](const char* key, double value_shown, const char* unit, const char* range) {
        location w;
        w.key = key;
        std::string shown = std::isfinite(value_shown) ? fmt::format("{:g} {}", value_shown, unit)
                                                       : std::string("a non-finite value");
        throw_input(w, fmt::format("{} is out of range; expected {}", shown, range));
    };
    // The upper bound keeps I = J * area finite (J stays below ~1e13 A/m^2 inside the model's
    // domain) and is far beyond any tunnel junction.
    if (!(std::isfinite(area_m2) && area_m2 > 0 && area_m2 <= 1e-6))
        bad("geometry.area", area_m2, "m^2", "an area in (0, 1e-6 m^2]");
    if (!(std::isfinite(apex_radius_m) && apex_radius_m > 0 && apex_radius_m <= 1e-5))
        bad("geometry.apex_radius", apex_radius_m * 1e9, "nm", "a radius in (0, 10 um]");
    if (!(std::isfinite(contact_distance_m) && contact_distance_m > 0 && contact_distance_m < 1e-9))
        bad("geometry.contact_distance", contact_distance_m * 1e9, "nm", "a distance in (0, 1 nm)");
}

double contact_anchored_area(const model_options& model, const geometry_options& g) {
    const double dV = 1e-3;  // linear response: J/V at 1 mV equals dJ/dV(0) to < 1e-5
    double sigma = current_density(model, g.contact_distance_m, dV) / dV;
    return si::conductance_quantum / sigma;
}

namespace {

using kronrod15 = boost::math::quadrature::gauss_kronrod<double, 15>;

// One 15-point Gauss-Kronrod rule on [a, b] with its error estimate; halves are refined only while
// the estimate exceeds abs_tol (an absolute share of the whole integral, not of this piece: far
// pieces of the tail hold 1e-13 of the total and need no relative accuracy).
template <class F>
double kronrod_to(const F& f, double a, double b, double abs_tol, int depth) {
    double err = 0.0;
    const double est = kronrod15::integrate(f, a, b, 0, 0.0, &err);
    if (err <= abs_tol || depth <= 0) return est;
    const double mid = 0.5 * (a + b);
    return kronrod_to(f, a, mid, 0.5 * abs_tol, depth - 1) + kronrod_to(f, mid, b, 0.5 * abs_tol, depth - 1);
}

}  // namespace

// u = r^2 / (2R) turns 2 pi r dr into 2 pi R du. J falls roughly as e^(-2 kappa u), so the integral
// runs in units of the local e-fold length L (measured from J itself), on pieces of 1, 2, 4, 8 and 16
// e-folds, then further 16-e-fold pieces while the estimated tail exceeds 1e-3 rel_tol of the total (a
// slower decay than the probe suggested is caught there). Each piece is a 15-point Gauss-Kronrod rule,
// halved where its error estimate exceeds its share of rel_tol times the total (about 1 - 1/e of the
// integral lies in the first e-fold, so the first rule's value sets the scale). In units of L the
// pieces are O(1) long, where the rule's error estimate is meaningful.
double paraboloid_integral(const std::function<double(double)>& j, double R, double s, double rel_tol) {
    const double j0 = j(s);
    if (j0 == 0.0) return 0.0;
    const double probe = 0.02e-9;
    const double j1 = j(s + probe);
    double rate = (j1 != 0.0 && std::abs(j1) < std::abs(j0)) ? std::log(std::abs(j0 / j1)) / probe : 1e10;
    rate = std::clamp(rate, 1e9, 1e11);
    const double L = 1.0 / rate;  // one e-fold (m)
    auto f = [&](double t) { return j(s + t * L); };
    // The whole integral in units of L is about j0 (exactly for an exponential): the error budget.
    const double budget = 0.2 * rel_tol * std::abs(j0);
    double sum = 0.0, t = 0.0;
    for (double width : {1.0, 2.0, 4.0, 8.0, 16.0}) {
        sum += kronrod_to(f, t, t + width, budget, 10);
        t += width;
    }
    // 31 e-folds leave e^-31 = 3e-14 of a pure exponential. The rest is estimated from the decay at
    // the cut (two evaluations); only a heavier tail than 1e-3 rel_tol gets further pieces.
    for (int extra = 0; extra < 16; ++extra) {
        const double a = f(t), b = f(t + 1.0);
        const double tail = (b != 0.0 && std::abs(b) < std::abs(a)) ? std::abs(a) / std::log(std::abs(a / b))
                                                                       : std::abs(a) * 1e6;
        if (tail <= 1e-3 * rel_tol * std::abs(sum)) break;
        sum += kronrod_to(f, t, t + 16.0, budget, 10);
        t += 16.0;
    }
    return 2.0 * std::numbers::pi * R * sum * L;
}

namespace {

// J and dJ/ds at the apex, the way the paraboloid rule wants them: analytic for wkb, and for other
// methods J alone (they use the adaptive rule, which needs no derivative).
gap_sample apex_sample(const model_options& model, double s, double V) {
    if (model.method != method_kind::wkb) return {current_density(model, s, V), 0.0};
    const current_density_slopes d = current_density_derivatives(model, s, V, false);
    return {d.current_density_A_per_m2, d.d_ds_A_per_m3};
}

}  // namespace

double total_current(const model_options& model, const geometry_options& g, double s, double V) {
    switch (g.kind) {
        case geometry_kind::planar: return g.area_m2 * current_density(model, s, V);
        case geometry_kind::paraboloid:
            return detail::paraboloid_density_integral(model, g.apex_radius_m, s, V, false, apex_sample(model, s, V));
        case geometry_kind::contact_anchored: return contact_anchored_area(model, g) * current_density(model, s, V);
    }
    return 0.0;
}

geometry_options with_fixed_area(const model_options& model, const geometry_options& g) {
    if (g.kind != geometry_kind::contact_anchored) return g;
    geometry_options out = g;
    out.kind = geometry_kind::planar;
    out.area_m2 = contact_anchored_area(model, g);
    return out;
}

total_current_sample total_current_with_slope(const model_options& model, const geometry_options& g, double s,
                                              double V) {
    total_current_sample out;
    if (g.kind == geometry_kind::paraboloid) {
        const gap_sample apex = apex_sample(model, s, V);
        const double R = g.apex_radius_m;
        out.current_A = detail::paraboloid_density_integral(model, R, s, V, false, apex);
        out.d_ln_current_ds_per_m = -2.0 * std::numbers::pi * R * apex.value / out.current_A;
        return out;
    }
    const double area = g.kind == geometry_kind::planar ? g.area_m2 : contact_anchored_area(model, g);
    const current_density_slopes d = current_density_derivatives(model, s, V, false);
    out.current_A = area * d.current_density_A_per_m2;
    out.d_ln_current_ds_per_m = d.d_ds_A_per_m3 / d.current_density_A_per_m2;
    return out;
}

}  // namespace tipgap
