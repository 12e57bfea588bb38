#include "model/detail/exponent_table.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <vector>

#include "tipgap/model/transmission.hpp"

namespace tipgap::detail {
namespace {

// Accept n nodes when the last two Chebyshev coefficients (a close bound on the interpolation
// error for a geometrically convergent series) are below tol.
bool converged(const chebyshev_interpolant& fit, double tol) {
    const auto& c = fit.coefficients();
    const std::size_t n = c.size() - 1;
    return std::abs(c[n]) + std::abs(c[n - 1]) < tol;
}

double max_abs(const std::vector<double>& v) {
    double m = 0.0;
    for (double x : v) m = std::max(m, std::abs(x));
    return m;
}

}  // namespace

exponent_sample exponent_table::node_value(double E) const {
    if (!derivatives_) return {wkb_exponent(b_, E, tol_), 0.0, 0.0};
    exponent_sample v = wkb_exponent_sample(b_, E, tol_);
    // The last node sits on the top (up to rounding), where the derivatives take their limit.
    if (b_.top_J() - E <= 1e-9 * (hi_ - lo_)) {
        const exponent_sample top = wkb_exponent_at_top(b_);
        v.d_ds_per_m = top.d_ds_per_m;
        v.d_dV_per_V = top.d_dV_per_V;
    }
    return v;
}

exponent_table::exponent_table(const barrier& b, double e_lo, double e_hi, double tol, bool derivatives)
    : b_(b), lo_(e_lo), hi_(e_hi), tol_(tol), derivatives_(derivatives) {
    direct_ = b.image() == image_kind::none || !(e_hi > e_lo);
    if (direct_) return;
    int n = 16;
    std::vector<exponent_sample> vals(n + 1);
    for (int j = 0; j <= n; ++j) vals[j] = node_value(chebyshev_interpolant::node(lo_, hi_, j, n));
    bool theta_done = false;
    for (;;) {
        const bool last = 2 * n > kMaxNodes;
        std::vector<double> theta(n + 1), ds(n + 1), dV(n + 1);
        for (int j = 0; j <= n; ++j) {
            theta[j] = vals[j].theta;
            ds[j] = vals[j].d_ds_per_m;
            dV[j] = vals[j].d_dV_per_V;
        }
        if (!theta_done) {
            fit_.fit(lo_, hi_, theta);
            theta_done = converged(fit_, tol_) || last;
        }
        bool done = theta_done;
        if (derivatives_) {
            fit_ds_.fit(lo_, hi_, ds);
            fit_dV_.fit(lo_, hi_, dV);
            done = done && ((converged(fit_ds_, tol_ * max_abs(ds)) && converged(fit_dV_, tol_ * max_abs(dV))) || last);
        }
        if (done) break;
        // Double n, reusing the old nodes.
        std::vector<exponent_sample> next(2 * n + 1);
        for (int j = 0; j <= 2 * n; ++j)
            next[j] = j % 2 == 0 ? vals[j / 2] : node_value(chebyshev_interpolant::node(lo_, hi_, j, 2 * n));
        vals.swap(next);
        n *= 2;
    }
}

double exponent_table::transmission(double E) const {
    if (E >= b_.top_J()) return 1.0;
    if (direct_ || E > hi_) return std::exp(-wkb_exponent(b_, E, tol_));
    return std::exp(-std::max(0.0, fit_(E)));
}

exponent_sample exponent_table::sample(double E) const {
    if (E >= b_.top_J()) return {};
    if (direct_ || E > hi_) return derivatives_ ? wkb_exponent_sample(b_, E, tol_) : node_value(E);
    exponent_sample s;
    if (!derivatives_) {
        s.theta = std::max(0.0, fit_(E));
        return s;
    }
    // All three share their node count unless theta converged earlier than its derivatives.
    if (fit_.coefficients().size() == fit_ds_.coefficients().size()) {
        std::array<double, 3> v{};
        chebyshev_interpolant::evaluate_together<3>({&fit_, &fit_ds_, &fit_dV_}, E, v);
        s = {std::max(0.0, v[0]), v[1], v[2]};
    } else {
        std::array<double, 2> v{};
        chebyshev_interpolant::evaluate_together<2>({&fit_ds_, &fit_dV_}, E, v);
        s = {std::max(0.0, fit_(E)), v[0], v[1]};
    }
    return s;
}

}  // namespace tipgap::detail
