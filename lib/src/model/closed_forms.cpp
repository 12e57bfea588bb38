// Closed-form tunnelling results: Simmons 1963, Fowler-Nordheim, Murphy-Good with the
// Schottky-Nordheim barrier functions v(f), t(f). SI inside.
#include "tipgap/model/closed_forms.hpp"

#include <boost/math/special_functions/ellint_1.hpp>
#include <boost/math/special_functions/ellint_2.hpp>
#include <cmath>
#include <numbers>
#include <string>

#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap {

namespace {

using std::numbers::pi;
constexpr double e = si::elementary_charge;

void require(bool ok, const char* key, const std::string& why) {
    if (!ok) {
        location where;
        where.key = key;
        throw_input(where, why);
    }
}

// Simmons' exponent factor A = 2 ds sqrt(2m)/hbar (J^-1/2), beta = 1.
double simmons_A(double width_m) { return 2.0 * width_m * std::sqrt(2.0 * si::electron_mass) / si::hbar; }

// SI Fowler-Nordheim constants: a = e^3/(8 pi h) (A J V^-2), b = (4/3) sqrt(2m)/(e hbar) (J^-3/2 V m^-1).
constexpr double fn_a_si() { return e * e * e / (8.0 * pi * si::planck_h); }
double fn_b_si() { return (4.0 / 3.0) * std::sqrt(2.0 * si::electron_mass) / (e * si::hbar); }

// Parameter m = (1 - l)/(1 + l) of the Forbes-Deane elliptic forms and the modulus k = sqrt(m)
// that Boost.Math takes.
struct sn_args {
    double l, k;
};
sn_args sn_arguments(double f) {
    require(std::isfinite(f) && f >= 0.0 && f <= 1.0, "f",
            "scaled barrier field must be in [0, 1] (f > 1: the barrier top is below the Fermi level)");
    const double l = std::sqrt(f);
    return {l, std::sqrt((1.0 - l) / (1.0 + l))};
}

// Below this f the K(m) term is l K(m) ~ l ln(1/l) and m rounds to 1 (where K diverges); the
// Forbes 2006 form is then exact to O(f^2 ln f), far below double precision of v ~ 1.
constexpr double f_tiny = 1e-24;

}  // namespace

double simmons_intermediate(double phibar_J, double width_m, double eV_J) {
    require(std::isfinite(phibar_J) && phibar_J > 0.0, "phibar", "mean barrier height must be > 0");
    require(std::isfinite(width_m) && width_m > 0.0, "width", "barrier width must be > 0");
    require(std::isfinite(eV_J) && eV_J >= 0.0, "eV", "e|V| must be >= 0");
    const double A = simmons_A(width_m);
    const double sq = std::sqrt(phibar_J);
    // J = J0 phibar e^{-A sq} [1 - (1 + eV/phibar) e^{-A (sqrt(phibar + eV) - sq)}], written with
    // log1p/expm1 so that the zero-bias limit (J ∝ V) keeps full precision instead of cancelling.
    const double dsq = eV_J / (std::sqrt(phibar_J + eV_J) + sq);
    const double bracket = -std::expm1(std::log1p(eV_J / phibar_J) - A * dsq);
    const double J0 = e / (2.0 * pi * si::planck_h * width_m * width_m);
    return J0 * phibar_J * std::exp(-A * sq) * bracket;
}

simmons_image_result simmons_image_barrier(double phi0_J, double gap_m, double eV_J, double K) {
    require(std::isfinite(phi0_J) && phi0_J > 0.0, "phi0", "barrier height must be > 0");
    require(std::isfinite(gap_m) && gap_m > 0.0, "gap", "gap must be > 0");
    require(std::isfinite(eV_J) && eV_J >= 0.0 && eV_J < phi0_J, "eV",
            "e|V| must be in [0, phi0) for Simmons' low/intermediate-voltage image formula");
    require(std::isfinite(K) && K >= 1.0, "relative_permittivity", "must be >= 1");
    simmons_image_result r;
    const double s = gap_m;
    // SI reading of Simmons' lambda that matches the exact image series (see barrier.hpp).
    const double lambda = si::coulomb_e2 * std::numbers::ln2 / (4.0 * K * s);
    r.lambda_J = lambda;
    r.s1_m = 1.2 * lambda * s / phi0_J;
    r.s2_m = s * (1.0 - 9.2 * lambda / (3.0 * phi0_J + 4.0 * lambda - 2.0 * eV_J)) + r.s1_m;
    if (!(r.s2_m > r.s1_m && r.s2_m < s)) {
        throw error(error_kind::no_answer,
                    "Simmons image barrier: the image force closes the barrier (turning points s1 >= s2)");
    }
    const double s1 = r.s1_m, s2 = r.s2_m;
    r.phibar_J = phi0_J - (eV_J / (2.0 * s)) * (s1 + s2) -
                 (1.15 * lambda * s / (s2 - s1)) * std::log(s2 * (s - s1) / (s1 * (s - s2)));
    if (!(r.phibar_J > 0.0)) {
        throw error(error_kind::no_answer, "Simmons image barrier: mean barrier height is not positive");
    }
    return r;
}

double simmons_image(double phi0_J, double gap_m, double eV_J, double K) {
    const simmons_image_result r = simmons_image_barrier(phi0_J, gap_m, eV_J, K);
    return simmons_intermediate(r.phibar_J, r.s2_m - r.s1_m, eV_J);
}

double fn_a_A_eV_per_V2() { return fn_a_si() / e; }

double fn_b_per_eV32_V_per_nm() { return fn_b_si() * std::pow(e, 1.5) * 1e-9; }

double scaled_barrier_field(double F_V_per_m, double phi_J) {
    require(std::isfinite(F_V_per_m) && F_V_per_m >= 0.0, "field", "must be >= 0 V/m");
    require(std::isfinite(phi_J) && phi_J > 0.0, "work_function", "must be > 0");
    return si::coulomb_e2 * e * F_V_per_m / (phi_J * phi_J);
}

double sn_v_exact(double f) {
    const sn_args a = sn_arguments(f);
    if (f < f_tiny) return sn_v_forbes(f);
    namespace bm = boost::math;
    return std::sqrt(1.0 + a.l) * (bm::ellint_2(a.k) - a.l * bm::ellint_1(a.k));
}

double sn_t_exact(double f) {
    // Forbes & Deane 2007 form t = (1+l)^(-1/2) [(1+l) E(m) - l K(m)], equal to v - (4/3) f dv/df
    // (checked against a finite-difference derivative of v in tests/closed_forms_test.cpp).
    const sn_args a = sn_arguments(f);
    if (f < f_tiny) return sn_t_forbes(f);
    namespace bm = boost::math;
    return ((1.0 + a.l) * bm::ellint_2(a.k) - a.l * bm::ellint_1(a.k)) / std::sqrt(1.0 + a.l);
}

double sn_v_forbes(double f) {
    require(std::isfinite(f) && f >= 0.0 && f <= 1.0, "f", "scaled barrier field must be in [0, 1]");
    if (f == 0.0) return 1.0;  // f ln f -> 0
    return 1.0 - f + (f / 6.0) * std::log(f);
}

double sn_t_forbes(double f) {
    require(std::isfinite(f) && f >= 0.0 && f <= 1.0, "f", "scaled barrier field must be in [0, 1]");
    if (f == 0.0) return 1.0;
    return 1.0 + f / 9.0 - (f / 18.0) * std::log(f);
}

double fowler_nordheim_elementary(double F_V_per_m, double phi_J) {
    require(std::isfinite(F_V_per_m) && F_V_per_m > 0.0, "field", "must be > 0 V/m");
    require(std::isfinite(phi_J) && phi_J > 0.0, "work_function", "must be > 0");
    return fn_a_si() * F_V_per_m * F_V_per_m / phi_J * std::exp(-fn_b_si() * std::pow(phi_J, 1.5) / F_V_per_m);
}

double murphy_good(double F_V_per_m, double phi_J) {
    require(std::isfinite(F_V_per_m) && F_V_per_m > 0.0, "field", "must be > 0 V/m");
    const double f = scaled_barrier_field(F_V_per_m, phi_J);
    const double v = sn_v_exact(f), t = sn_t_exact(f);
    return fn_a_si() * F_V_per_m * F_V_per_m / (phi_J * t * t) *
           std::exp(-v * fn_b_si() * std::pow(phi_J, 1.5) / F_V_per_m);
}

}  // namespace tipgap
