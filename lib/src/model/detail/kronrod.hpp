#pragma once
// Adaptive 15-point Gauss-Kronrod quadrature of a vector integrand on consecutive pieces, for the
// energy integral of J and of its derivatives on the same nodes.
//
// Each component keeps its own error control: a piece is halved while any component's error
// estimate exceeds that component's share of the tolerance, and a component takes its value from
// the coarsest level at which its own estimate was good enough. Component 0 therefore follows
// exactly the decisions (and the arithmetic, the order of Boost 1.74's
// gauss_kronrod<double, 15>::integrate on [-1, 1]) of a scalar integration of component 0 alone:
// J is the same number whether or not its derivatives are computed alongside.
#include <array>
#include <boost/math/quadrature/gauss.hpp>
#include <boost/math/quadrature/gauss_kronrod.hpp>
#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>
#include <vector>

namespace tipgap::detail {

template <std::size_t K>
using values = std::array<double, K>;

// One rule on [a, b] (the piece is mapped onto [-1, 1] first, because Boost 1.74's own recursion
// compares the unscaled error estimate with the scaled integral). err: |K15 - G7| per component,
// at least 2 eps |K15|, as Boost computes it.
template <std::size_t K, class F>
values<K> kronrod15(const F& f, double a, double b, values<K>& err) {
    using kronrod = boost::math::quadrature::gauss_kronrod<double, 15>;
    using gauss = boost::math::quadrature::gauss<double, 7>;
    const auto& x = kronrod::abscissa();
    const auto& wk = kronrod::weights();
    const auto& wg = gauss::weights();
    const double mid = 0.5 * (a + b), half = 0.5 * (b - a);
    auto g = [&](double t) { return f(mid + half * t); };
    values<K> k{}, gs{};
    const values<K> f0 = g(0.0);
    for (std::size_t c = 0; c < K; ++c) {
        k[c] = f0[c] * wk[0];
        gs[c] = f0[c] * wg[0];
    }
    // Gauss nodes (even Kronrod indices) first, then the Kronrod extension: Boost's order.
    for (unsigned i = 2; i < x.size(); i += 2) {
        const values<K> fp = g(x[i]), fm = g(-x[i]);
        for (std::size_t c = 0; c < K; ++c) {
            k[c] += (fp[c] + fm[c]) * wk[i];
            gs[c] += (fp[c] + fm[c]) * wg[i / 2];
        }
    }
    for (unsigned i = 1; i < x.size(); i += 2) {
        const values<K> fp = g(x[i]), fm = g(-x[i]);
        for (std::size_t c = 0; c < K; ++c) k[c] += (fp[c] + fm[c]) * wk[i];
    }
    values<K> est{};
    for (std::size_t c = 0; c < K; ++c) {
        const double e = std::max(std::abs(k[c] - gs[c]), std::abs(k[c] * std::numeric_limits<double>::epsilon() * 2.0));
        est[c] = half * k[c];
        err[c] = e * half;
    }
    return est;
}

// Refines [a, b] (whose rule gave est, err) by bisection. active: bit c set while component c still
// wants refinement here; abs_tol: per-component absolute tolerance of this piece.
template <std::size_t K, class F>
values<K> adaptive_kronrod(const F& f, double a, double b, const values<K>& est, const values<K>& err,
                           const values<K>& abs_tol, unsigned active, int depth) {
    unsigned still = 0;
    for (std::size_t c = 0; c < K; ++c)
        if ((active >> c & 1u) && depth > 0 && !(err[c] <= abs_tol[c])) still |= 1u << c;
    if (still == 0) return est;
    const double mid = 0.5 * (a + b);
    values<K> e1{}, e2{}, half_tol{};
    for (std::size_t c = 0; c < K; ++c) half_tol[c] = 0.5 * abs_tol[c];
    const values<K> r1 = kronrod15<K>(f, a, mid, e1), r2 = kronrod15<K>(f, mid, b, e2);
    const values<K> left = adaptive_kronrod<K>(f, a, mid, r1, e1, half_tol, still, depth - 1);
    const values<K> right = adaptive_kronrod<K>(f, mid, b, r2, e2, half_tol, still, depth - 1);
    values<K> out = est;
    for (std::size_t c = 0; c < K; ++c)
        if (still >> c & 1u) out[c] = left[c] + right[c];
    return out;
}

// ∫ f over consecutive pieces [cuts[i], cuts[i+1]], each component to a relative tolerance of its
// own total: one rule per piece first, then refinement only where a piece's error matters.
template <std::size_t K, class F>
values<K> integrate_pieces(const F& f, const std::vector<double>& cuts, double rel_tol) {
    const std::size_t n = cuts.size() - 1;
    std::vector<values<K>> est(n), err(n);
    values<K> total{};
    for (std::size_t i = 0; i < n; ++i) {
        est[i] = kronrod15<K>(f, cuts[i], cuts[i + 1], err[i]);
        for (std::size_t c = 0; c < K; ++c) total[c] += est[i][c];
    }
    values<K> abs_tol{};
    for (std::size_t c = 0; c < K; ++c) abs_tol[c] = rel_tol * std::abs(total[c]) / static_cast<double>(n);
    values<K> sum{};
    const unsigned all = (1u << K) - 1u;
    for (std::size_t i = 0; i < n; ++i) {
        const values<K> piece = adaptive_kronrod<K>(f, cuts[i], cuts[i + 1], est[i], err[i], abs_tol, all, 16);
        for (std::size_t c = 0; c < K; ++c) sum[c] += piece[c];
    }
    return sum;
}

}  // namespace tipgap::detail
