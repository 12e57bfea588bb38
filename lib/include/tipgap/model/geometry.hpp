#pragma once
// From current density to total current: the tip's shape.
#include <functional>

#include "tipgap/model/model.hpp"

namespace tipgap {

enum class geometry_kind {
    planar,            // I = J * area
    paraboloid,        // apex radius R: local gap s + r^2/(2R), I = ∫ J 2 pi r dr
    contact_anchored,  // effective area fixed so that the conductance is G0 at the contact distance
};
template <>
struct enum_names<geometry_kind> {
    static constexpr enum_name<geometry_kind> table[] = {{geometry_kind::planar, "planar"},
                                                         {geometry_kind::paraboloid, "paraboloid"},
                                                         {geometry_kind::contact_anchored, "contact_anchored"}};
};

struct geometry_options {
    geometry_kind kind = geometry_kind::planar;
    double area_m2 = 1e-18;              // planar area (m^2), > 0
    double apex_radius_m = 10e-9;        // paraboloid apex radius R (m), > 0
    double contact_distance_m = 0.25e-9; // gap at which G = G0 (m), > 0 (common practice, no source)

    // Throws tipgap::error (input) naming the key when a value is out of range.
    void validate() const;
};

// Total current (A), with the sign of the bias. gap_m: closest tip-sample distance s (m), > 0;
// bias_V: sample bias (V).
double total_current(const model_options& model, const geometry_options& geometry, double gap_m, double bias_V);

// Effective area (m^2) of the contact-anchored geometry: G0 divided by the zero-bias conductance
// density at the contact distance.
double contact_anchored_area(const model_options& model, const geometry_options& geometry);

// The paraboloid integral I = 2 pi R ∫_0^inf j(s + u) du (u = r^2 / 2R, so 2 pi r dr = 2 pi R du) for
// any current density j(gap) that falls off with the gap (Lang 1986, Phys. Rev. B 34, 5947, uses the
// same local-planar sum over a curved tip). j_of_gap: J (A/m^2) at a gap (m); apex_radius_m: R (m),
// > 0; gap_m: s (m), > 0; rel_tol: relative accuracy of the integral, [1e-12, 1e-2].
// For j = J0 e^(-2 kappa s) the result is pi R J(s) / kappa exactly.
double paraboloid_integral(const std::function<double(double)>& j_of_gap, double apex_radius_m, double gap_m,
                           double rel_tol);

}  // namespace tipgap
