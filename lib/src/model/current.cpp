#include "tipgap/model/current.hpp"

#include <algorithm>
#include <boost/math/quadrature/gauss_kronrod.hpp>
#include <cmath>
#include <vector>

#include "model/detail/chebyshev.hpp"
#include "model/detail/wkb_core.hpp"
#include "tipgap/model/barrier.hpp"
#include "tipgap/model/closed_forms.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/transmission.hpp"

namespace tipgap {
namespace {

// The WKB exponent theta(E) does not depend on the supply function, and it is analytic in E below
// the barrier top, so it is sampled once per barrier at Chebyshev-Lobatto energies (doubling the
// node count until the interpolant predicts the new nodes to within tol) and the energy integral
// then runs on the interpolant. This is the "reuse work across energies" of the design: ~33 barrier
// integrals per J instead of one per quadrature node.
class exponent_table {
public:
    exponent_table(const barrier& b, double e_lo, double e_hi, double tol)
        : b_(b), lo_(e_lo), hi_(e_hi), tol_(tol) {
        direct_ = b.image() == image_kind::none || !(e_hi > e_lo);
        if (direct_) return;
        // Accept n nodes when the last two Chebyshev coefficients (a close bound on the
        // interpolation error for a geometrically convergent series) are below tol; otherwise
        // double n, reusing the old nodes.
        int n = 16;
        std::vector<double> vals(n + 1);
        for (int j = 0; j <= n; ++j) vals[j] = wkb_exponent(b, detail::chebyshev_interpolant::node(lo_, hi_, j, n), tol);
        for (;;) {
            fit_.fit(lo_, hi_, vals);
            const auto& c = fit_.coefficients();
            if (std::abs(c[n]) + std::abs(c[n - 1]) < tol || 2 * n > kMaxNodes) break;
            std::vector<double> next(2 * n + 1);
            for (int j = 0; j <= 2 * n; ++j) {
                next[j] = j % 2 == 0 ? vals[j / 2]
                                     : wkb_exponent(b, detail::chebyshev_interpolant::node(lo_, hi_, j, 2 * n), tol);
            }
            vals.swap(next);
            n *= 2;
        }
    }

    double transmission(double E) const {
        if (E >= b_.top_J()) return 1.0;
        if (direct_ || E > hi_) return std::exp(-wkb_exponent(b_, E, tol_));
        return std::exp(-std::max(0.0, fit_(E)));
    }

private:
    static constexpr int kMaxNodes = 256;
    const barrier& b_;
    double lo_, hi_, tol_;
    bool direct_ = false;
    detail::chebyshev_interpolant fit_;
};

// Adaptive bisection around Boost's 15-point Gauss-Kronrod pair, to an absolute tolerance. Each
// piece is mapped onto [-1, 1] before the rule is applied, because Boost 1.74's own recursion
// compares the unscaled error estimate with the scaled integral and so over-refines short pieces.
template <class F>
double gauss_kronrod_piece(const F& f, double a, double b, double* err) {
    using gk = boost::math::quadrature::gauss_kronrod<double, 15>;
    const double mid = 0.5 * (a + b), half = 0.5 * (b - a);
    auto g = [&](double t) { return f(mid + half * t); };
    double e = 0.0;
    double est = half * gk::integrate(g, -1.0, 1.0, 0, 0.0, &e);
    *err = e * half;
    return est;
}

template <class F>
double adaptive_gauss_kronrod(const F& f, double a, double b, double est, double err, double abs_tol, int depth) {
    if (depth <= 0 || err <= abs_tol) return est;
    const double mid = 0.5 * (a + b);
    double e1 = 0, e2 = 0;
    double r1 = gauss_kronrod_piece(f, a, mid, &e1), r2 = gauss_kronrod_piece(f, mid, b, &e2);
    return adaptive_gauss_kronrod(f, a, mid, r1, e1, 0.5 * abs_tol, depth - 1) +
           adaptive_gauss_kronrod(f, mid, b, r2, e2, 0.5 * abs_tol, depth - 1);
}

// ∫ f over consecutive pieces [cuts[i], cuts[i+1]] to a relative tolerance of the whole sum: one
// rule per piece first, then refinement only where a piece's error matters for the total.
template <class F>
double integrate_pieces(const F& f, const std::vector<double>& cuts, double rel_tol) {
    const std::size_t n = cuts.size() - 1;
    std::vector<double> est(n), err(n);
    double total = 0.0;
    for (std::size_t i = 0; i < n; ++i) {
        est[i] = gauss_kronrod_piece(f, cuts[i], cuts[i + 1], &err[i]);
        total += est[i];
    }
    const double abs_tol = rel_tol * std::abs(total) / static_cast<double>(n);
    double sum = 0.0;
    for (std::size_t i = 0; i < n; ++i) sum += adaptive_gauss_kronrod(f, cuts[i], cuts[i + 1], est[i], err[i], abs_tol, 16);
    return sum;
}

double wkb_current_density(const model_options& o, double s, double V) {
    barrier b(o, s, V);
    const double eV = si::elementary_charge * V;
    const double kT = si::boltzmann_k * o.temperature_K;
    const double e_a = std::min(0.0, -eV), e_b = std::max(0.0, -eV);
    const double e_lo = b.band_bottom_J();
    // Above e_b the supply falls as e^(-(E - e_b)/kT): 37 kT leaves < 1e-16 of it.
    const double e_up = kT > 0.0 ? e_b + 37.0 * kT : e_b;
    if (!(e_up > e_lo)) return 0.0;

    // Breakpoints: the two Fermi edges (smeared over a few kT), and the barrier top, where D(E) has a
    // kink. Each piece is smooth, so Gauss-Kronrod converges fast on it.
    std::vector<double> cuts{e_lo, e_up};
    // Near a Fermi edge the supply varies on the scale kT with complex poles at +-i pi kT, so the
    // edges get cuts at 0, +-4 and +-12 kT: every piece is then resolved by one Gauss-Kronrod rule.
    auto add_cut = [&](double e) {
        if (e > e_lo && e < e_up) cuts.push_back(e);
    };
    add_cut(b.top_J());
    for (double edge : {e_a, e_b}) {
        add_cut(edge);
        if (kT > 0.0) {
            for (double m : {-12.0, -4.0, 4.0, 12.0}) add_cut(edge + m * kT);
        }
    }
    std::sort(cuts.begin(), cuts.end());
    cuts.erase(std::unique(cuts.begin(), cuts.end()), cuts.end());

    // Exponent accuracy: an error d in theta is a relative error d in D, so theta to 0.1 rel_tol.
    exponent_table table(b, e_lo, std::min(b.top_J(), e_up), 0.1 * o.rel_tol);
    // The quadrature runs in eV: Boost's Gauss-Kronrod compares its unscaled error estimate with
    // the scaled integral, which only works for O(1) interval lengths.
    constexpr double J_per_eV = si::electron_volt;
    auto integrand = [&](double e) {
        double E = e * J_per_eV;
        return table.transmission(E) * supply_function(E, eV, kT) / J_per_eV;
    };
    std::vector<double> cuts_eV(cuts.size());
    for (std::size_t i = 0; i < cuts.size(); ++i) cuts_eV[i] = cuts[i] / J_per_eV;
    double sum = integrate_pieces(integrand, cuts_eV, 0.1 * o.rel_tol);
    return si::tsu_esaki_prefactor * sum * J_per_eV * J_per_eV;
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
    return o.method == method_kind::simmons ? simmons_current_density(o, gap_m, bias_V)
                                            : wkb_current_density(o, gap_m, bias_V);
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

point_quantities evaluate_point(const model_options& o, double s, double V) {
    point_quantities p;
    p.gap_m = s;
    p.bias_V = V;
    p.temperature_K = o.temperature_K;
    p.current_density_A_per_m2 = current_density(o, s, V);
    // Steps: large enough that the quadrature error (rel_tol) stays far below the difference, small
    // enough that the O(h^2) truncation error is below 1e-5 relative (ln J is nearly linear in s).
    const double hs = std::min(0.01e-9, 0.25 * s);
    double jp = current_density(o, s + hs, V), jm = current_density(o, s - hs, V);
    const double dV = std::max(1e-3, 0.01 * std::abs(V));
    double jvp = current_density(o, s, V + dV);
    double jvm = current_density(o, s, V - dV);
    p.differential_conductance_density_S_per_m2 = (jvp - jvm) / (2.0 * dV);
    p.conductance_density_S_per_m2 = V != 0.0 ? p.current_density_A_per_m2 / V : p.differential_conductance_density_S_per_m2;
    if (V != 0.0 && jp != 0.0 && jm != 0.0) {
        double dlnj = (std::log(std::abs(jp)) - std::log(std::abs(jm))) / (2.0 * hs);
        p.decay_constant_per_m = -0.5 * dlnj;
        p.apparent_barrier_J = si::hbar * si::hbar / (8.0 * si::electron_mass) * dlnj * dlnj;
    } else {
        // At V = 0 use the conductance (J/V has the same s-dependence in the linear-response limit).
        double gp = current_density(o, s + hs, dV), gm = current_density(o, s - hs, dV);
        double dlnj = (std::log(std::abs(gp)) - std::log(std::abs(gm))) / (2.0 * hs);
        p.decay_constant_per_m = -0.5 * dlnj;
        p.apparent_barrier_J = si::hbar * si::hbar / (8.0 * si::electron_mass) * dlnj * dlnj;
    }
    p.kind = classify(o, s, V, &p.barrier_top_J, &p.barrier_width_m);
    return p;
}

}  // namespace tipgap
