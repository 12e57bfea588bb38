#include "tipgap/geometry.hpp"

#include <boost/math/quadrature/gauss_kronrod.hpp>
#include <cmath>
#include <numbers>

#include "tipgap/constants.hpp"
#include "tipgap/current.hpp"
#include "tipgap/error.hpp"

namespace tipgap {

const char* to_string(geometry_kind k) {
    switch (k) {
        case geometry_kind::planar: return "planar";
        case geometry_kind::paraboloid: return "paraboloid";
        case geometry_kind::contact_anchored: return "contact_anchored";
    }
    return "?";
}

bool from_string(const std::string& s, geometry_kind& out) {
    for (geometry_kind k : {geometry_kind::planar, geometry_kind::paraboloid, geometry_kind::contact_anchored}) {
        if (s == to_string(k)) {
            out = k;
            return true;
        }
    }
    return false;
}

void geometry_options::validate() const {
    auto bad = [](const char* key, const char* why) {
        location w;
        w.key = key;
        throw_input(w, why);
    };
    if (!(std::isfinite(area_m2) && area_m2 > 0)) bad("geometry.area", "must be a positive area");
    if (!(std::isfinite(apex_radius_m) && apex_radius_m > 0 && apex_radius_m <= 1e-5))
        bad("geometry.apex_radius", "must be in (0, 10 um]");
    if (!(std::isfinite(contact_distance_m) && contact_distance_m > 0 && contact_distance_m < 1e-9))
        bad("geometry.contact_distance", "must be in (0, 1 nm)");
}

double contact_anchored_area(const model_options& model, const geometry_options& g) {
    const double dV = 1e-3;  // linear response: J/V at 1 mV equals dJ/dV(0) to < 1e-5
    double sigma = current_density(model, g.contact_distance_m, dV) / dV;
    return si::conductance_quantum / sigma;
}

namespace {

// I = 2 pi R ∫_0^inf J(s + u, V) du after u = r^2 / (2R). J falls roughly as e^(-2 kappa u), so the
// integral is cut where the local decay says the rest is below 1e-12 of the total, and done on
// pieces of about one decay length with Gauss-Kronrod.
double paraboloid_current(const model_options& model, double R, double s, double V) {
    using gk = boost::math::quadrature::gauss_kronrod<double, 15>;
    double j0 = current_density(model, s, V);
    if (j0 == 0.0) return 0.0;
    const double probe = 0.02e-9;
    double j1 = current_density(model, s + probe, V);
    double rate = (j1 != 0.0 && std::abs(j1) < std::abs(j0)) ? std::log(std::abs(j0 / j1)) / probe : 1e10;
    rate = std::clamp(rate, 1e9, 1e11);
    const double L = 1.0 / rate;  // one e-fold (m)
    // Work in units of L so the rule sees O(1) intervals.
    auto f = [&](double t) { return current_density(model, s + t * L, V); };
    // Pieces of 1, 2, 4, 8 and 16 e-folds: 31 e-folds leave < 1e-13 of the integral.
    double sum = 0.0;
    double t = 0.0;
    for (double width : {1.0, 2.0, 4.0, 8.0, 16.0}) {
        sum += gk::integrate(f, t, t + width, 0, 0.0);
        t += width;
    }
    return 2.0 * std::numbers::pi * R * sum * L;
}

}  // namespace

double total_current(const model_options& model, const geometry_options& g, double s, double V) {
    switch (g.kind) {
        case geometry_kind::planar: return g.area_m2 * current_density(model, s, V);
        case geometry_kind::paraboloid: return paraboloid_current(model, g.apex_radius_m, s, V);
        case geometry_kind::contact_anchored: return contact_anchored_area(model, g) * current_density(model, s, V);
    }
    return 0.0;
}

}  // namespace tipgap
