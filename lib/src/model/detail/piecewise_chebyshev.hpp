#pragma once
// Adaptive piecewise Chebyshev interpolation of an analytic function on [a, b]. A piece is accepted
// when the last two coefficients of its 16- or 32-interval Lobatto fit are below its tolerance (a
// close bound on the interpolation error of a geometrically convergent series, as in current.cpp);
// otherwise it is halved. Nearby complex singularities (resonances of T(E)) thus get short pieces
// and the smooth rest long ones.
#include <algorithm>
#include <cmath>
#include <vector>

#include "model/detail/chebyshev.hpp"

namespace tipgap::detail {

class piecewise_chebyshev {
public:
    // f: the function; [a, b]: the range, a < b; tol(values, lo, hi): the accepted error on the piece
    // [lo, hi] given f at its nodes; min_width: no piece is split below this width (the piece is
    // then kept and converged() turns false).
    template <class F, class Tol>
    piecewise_chebyshev(const F& f, double a, double b, const Tol& tol, double min_width) {
        fit_piece(f, a, b, tol, min_width);
    }

    double operator()(double x) const {
        auto it = std::upper_bound(breaks_.begin(), breaks_.end(), x);
        std::size_t i = it == breaks_.begin() ? 0 : static_cast<std::size_t>(it - breaks_.begin()) - 1;
        i = std::min(i, pieces_.size() - 1);
        return pieces_[i](x);
    }

    // Left ends of the pieces, ascending (the first is a).
    const std::vector<double>& breaks() const { return breaks_; }
    int evaluations() const { return evaluations_; }
    bool converged() const { return converged_; }

private:
    static constexpr int kFirst = 16, kSecond = 32;

    template <class F, class Tol>
    void fit_piece(const F& f, double lo, double hi, const Tol& tol, double min_width) {
        std::vector<double> vals(kFirst + 1);
        for (int j = 0; j <= kFirst; ++j) vals[j] = f(chebyshev_interpolant::node(lo, hi, j, kFirst));
        evaluations_ += kFirst + 1;
        chebyshev_interpolant fit;
        fit.fit(lo, hi, vals);
        if (tail(fit) > tol(vals, lo, hi)) {
            // Double the nodes, reusing the old ones (Lobatto nodes nest).
            std::vector<double> next(kSecond + 1);
            for (int j = 0; j <= kSecond; ++j) {
                next[j] = j % 2 == 0 ? vals[j / 2] : f(chebyshev_interpolant::node(lo, hi, j, kSecond));
            }
            evaluations_ += kSecond - kFirst;
            vals.swap(next);
            fit.fit(lo, hi, vals);
            if (tail(fit) > tol(vals, lo, hi)) {
                if (hi - lo > 2.0 * min_width) {
                    const double mid = 0.5 * (lo + hi);
                    fit_piece(f, lo, mid, tol, min_width);
                    fit_piece(f, mid, hi, tol, min_width);
                    return;
                }
                converged_ = false;
            }
        }
        breaks_.push_back(lo);
        pieces_.push_back(std::move(fit));
    }

    static double tail(const chebyshev_interpolant& fit) {
        const auto& c = fit.coefficients();
        const std::size_t n = c.size() - 1;
        return std::abs(c[n]) + std::abs(c[n - 1]);
    }

    std::vector<double> breaks_;
    std::vector<chebyshev_interpolant> pieces_;
    int evaluations_ = 0;
    bool converged_ = true;
};

}  // namespace tipgap::detail
