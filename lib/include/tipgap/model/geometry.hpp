#pragma once
// From current density to total current: the tip's shape.
#include <functional>
#include <limits>

#include "tipgap/model/current.hpp"
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

// One sample of a gap-dependent density j for the Gauss-Laguerre rule below.
struct gap_sample {
    double value = 0;  // j at the gap (e.g. A/m^2)
    double d_ds = 0;   // dj/ds at that gap (per m)
    double carried = 0;  // a second density integrated on the same nodes (e.g. dj/dV); 0 when unused
};

struct paraboloid_laguerre_result {
    double value = std::numeric_limits<double>::quiet_NaN();           // 2 pi R ∫_0^inf j(s + u) du
    double carried_value = std::numeric_limits<double>::quiet_NaN();   // 2 pi R ∫_0^inf carried(s + u) du
    double error_estimate = std::numeric_limits<double>::quiet_NaN();  // relative, of the last rule tried
    int nodes = 0;        // points of the last rule tried (4, 8 or 16)
    int evaluations = 0;  // samples of j taken, the apex not counted
    bool accepted = false;  // error_estimate <= rel_tol / 4; otherwise use paraboloid_integral
};

// The paraboloid integral by Gauss-Laguerre quadrature, for a j whose gap derivative is known.
// With r = -j'(s)/j(s) the local decay rate at the apex and t = r u,
//   I = 2 pi R ∫_0^inf j(s + u) du = (2 pi R / r) ∫_0^inf e^(-t) G(t) dt,  G(t) = e^t j(s + t/r),
// and G is smooth and slowly varying where ln j is nearly linear in the gap, which is what the
// Gauss-Laguerre rule integrates best (Abramowitz & Stegun 1964, eq. 25.4.45). Integrating by parts,
// the same integral is (2 pi R / r) [G(0) + ∫_0^inf e^(-t) G'(t) dt] with G' = e^t (j + j'/r): the
// same nodes give a second estimate from the gap derivatives, and the difference of the two is the
// error estimate (derived here). Rules of 4, 8 and 16 points are tried in turn. A carried density
// (such as dj/dV, which falls off with the gap like j) is summed on the same nodes; the rule is
// accepted on j's error estimate alone.
// j: the sample at a gap (m); apex: j and dj/ds at gap_m; apex_radius_m: R (m), > 0; gap_m: s (m),
// > 0; rel_tol: requested relative accuracy, [1e-12, 1e-2].
paraboloid_laguerre_result paraboloid_integral_laguerre(const std::function<gap_sample(double)>& j,
                                                        double apex_radius_m, double gap_m, double rel_tol,
                                                        const gap_sample& apex);

// Paraboloid current I (A) at the gap and bias of `apex`, reusing its J and dJ/ds (evaluate_point
// with the same model): the Gauss-Laguerre rule where it meets model.rel_tol, the adaptive
// paraboloid_integral otherwise (a barrier that collapses at the apex puts a kink into j, and
// methods other than wkb have no analytic gap derivative). apex_radius_m: R (m), > 0.
double paraboloid_current(const model_options& model, double apex_radius_m, const point_quantities& apex);

// The paraboloid current and its bias derivative from one pass: dI/dV = 2 pi R ∫ dJ/dV(s + u) du on
// the Gauss-Laguerre nodes that give I (method wkb: dJ/dV from the same energy integral as J).
// Where the rule does not apply, I as paraboloid_current and dI/dV by a central difference of I in
// V (step bias_step). apex: evaluate_point at a non-zero bias; apex_radius_m: R (m), > 0.
struct paraboloid_current_slopes {
    double current_A = 0;   // I (A), equal to paraboloid_current bit for bit
    double d_dV_A_per_V = 0;  // dI/dV at fixed gap (A/V)
};
paraboloid_current_slopes paraboloid_current_with_bias_slope(const model_options& model, double apex_radius_m,
                                                             const point_quantities& apex);

// Zero-bias conductance dI/dV at V = 0 (S) of the paraboloid, 2 pi R ∫ G(s + u) du with G the
// zero-bias conductance density; apex: evaluate_point at V = 0.
double paraboloid_zero_bias_conductance(const model_options& model, double apex_radius_m,
                                        const point_quantities& apex);

// Total current and the slope of its logarithm from the same evaluation. Planar and
// contact-anchored: J's own slope. Paraboloid: since I(s) = 2 pi R ∫_s^inf J, dI/ds = -2 pi R J(s)
// exactly. gap_m: s (m), > 0; bias_V: sample bias (V), non-zero for the slope to exist.
struct total_current_sample {
    double current_A = 0;                  // I with the sign of the bias
    double d_ln_current_ds_per_m = std::numeric_limits<double>::quiet_NaN();  // d ln|I| / ds (1/m)
};
total_current_sample total_current_with_slope(const model_options& model, const geometry_options& geometry,
                                              double gap_m, double bias_V);

// A contact-anchored geometry as the planar one with the same (anchored) area, so that a solver
// evaluating many gaps computes the anchor once; other kinds are returned unchanged.
geometry_options with_fixed_area(const model_options& model, const geometry_options& geometry);

}  // namespace tipgap
