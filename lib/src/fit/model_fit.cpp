// Fitting the tunnelling model (mean work function, gap offset, ln prefactor) to one sweep by
// Levenberg-Marquardt on ln|I|; see model_fit.hpp.
#include "tipgap/fit/model_fit.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <boost/math/distributions/students_t.hpp>
#include <boost/math/interpolators/cardinal_cubic_b_spline.hpp>
#include <cmath>
#include <fmt/format.h>

#include "tipgap/core/constants.hpp"
#include "tipgap/model/geometry.hpp"

namespace tipgap {

void model_fit_options::validate() const {
    auto bad = [](const char* key, const std::string& what) { throw_input(location{"", 0, 0, key}, what); };
    if (max_iterations < 5 || max_iterations > 1000) bad("max_iterations", "must be in [5, 1000]");
    if (grid_points < 8 || grid_points > 1000) bad("grid_points", "must be in [8, 1000]");
    if (!(work_function_step_J > 0.0)) bad("work_function_step_J", "must be > 0");
    if (!(confidence_level > 0.0 && confidence_level < 1.0)) bad("confidence_level", "must be in (0, 1)");
}

config with_mean_work_function(const config& c, double mean_J) {
    config out = c;
    const double half_diff = 0.5 * (c.model.tip.work_function_J - c.model.sample.work_function_J);
    out.model.tip.work_function_J = mean_J + half_diff;
    out.model.sample.work_function_J = mean_J - half_diff;
    return out;
}

namespace {

// Keep the fit where the model is meaningful: the closest fitted gap at least 0.2 nm (below it the
// image-lowered barrier collapses, see current.hpp regime::barrier_collapsed) and φ̄ in [1, 15] eV
// (common practice, no source).
constexpr double min_gap_nm = 0.2;
constexpr double min_work_function_eV = 1.0, max_work_function_eV = 15.0;
// Convergence: relative cost change below this and steps below 1e-7 eV / 1e-7 nm.
constexpr double cost_rtol = 1e-12;
constexpr double step_tol = 1e-7;

// ln|I_model(s)| on an equally spaced gap grid covering [s_lo, s_hi], as a cubic B-spline in nm.
class ln_current_grid {
public:
    ln_current_grid(const config& base, double mean_eV, double s_lo_nm, double s_hi_nm, std::size_t n, double bias_V,
                    int& evaluations) {
        const config c = with_mean_work_function(base, mean_eV * eV);
        // A margin of one grid step on each side keeps the used gaps away from the spline ends.
        const double h = (s_hi_nm - s_lo_nm) / static_cast<double>(n - 3);
        const double start = s_lo_nm - h;
        std::vector<double> v(n);
        for (std::size_t k = 0; k < n; ++k) {
            const double s = start + h * static_cast<double>(k);
            v[k] = std::log(std::abs(total_current(c.model, c.geometry, s * nm, bias_V)));
            ++evaluations;
        }
        spline_ = boost::math::interpolators::cardinal_cubic_b_spline<double>(v.begin(), v.end(), start, h);
    }
    double operator()(double s_nm) const { return spline_(s_nm); }
    double prime(double s_nm) const { return spline_.prime(s_nm); }

private:
    boost::math::interpolators::cardinal_cubic_b_spline<double> spline_;
};

}  // namespace

model_fit_result fit_model_to_sweep(const config& c, const curve_sweep& sweep, const fit_result& linear, double bias_V,
                                    const model_fit_options& opt, const location& where) {
    opt.validate();
    if (!(std::isfinite(bias_V) && bias_V != 0.0))
        throw_input(where, "the model comparison needs the bias: add '# bias: 100 mV' (for example) to the curve file");
    if (linear.model != fit_model::linear)
        throw_input(where, "the model comparison starts from the linear fit (fit_model::linear)");
    const std::size_t n = linear.used_rows.size();
    if (n < 4) throw_input(where, fmt::format("the model comparison needs at least 4 used points, got {}", n));

    model_fit_result r;
    std::vector<double> z(n), y(n), sw(n);
    for (std::size_t k = 0; k < n; ++k) {
        const std::size_t i = linear.used_rows[k];
        z[k] = sweep.z_m[i] / nm;
        y[k] = std::log(std::abs(sweep.current_A[i]));
        // √w = Î/σ from the linear fit's current; normalised to the largest (only ratios matter,
        // the covariance is scaled by the residual variance).
        sw[k] = std::exp(linear.line.intercept + linear.line.slope * sweep.z_m[i]);
    }
    const double sw_max = *std::max_element(sw.begin(), sw.end());
    for (double& v : sw) v /= sw_max;
    const double z_lo = *std::min_element(z.begin(), z.end()), z_hi = *std::max_element(z.begin(), z.end());
    r.points_used = n;

    const double phi0 = 0.5 * (c.model.tip.work_function_J + c.model.sample.work_function_J) / eV;
    const std::size_t m = opt.grid_points;
    const double bias = bias_V;

    // Starting gap offset: from a contact, or where the model with the config's area carries the
    // measured current at the closest used point (bisection on the monotonic ln|I(s)|).
    double s0 = opt.initial_gap_offset_m / nm;
    if (std::isnan(s0) && linear.contact.kind != contact_kind::none) s0 = linear.contact.gap_offset_m / nm;
    if (std::isnan(s0)) {
        const std::size_t k0 = static_cast<std::size_t>(std::min_element(z.begin(), z.end()) - z.begin());
        const config c0 = with_mean_work_function(c, phi0 * eV);
        double lo = min_gap_nm, hi = 3.0;
        const double target = y[k0];
        for (int it = 0; it < 40; ++it) {
            const double mid = 0.5 * (lo + hi);
            const double v = std::log(std::abs(total_current(c0.model, c0.geometry, mid * nm, bias)));
            ++r.model_evaluations;
            (v > target ? lo : hi) = mid;
        }
        s0 = 0.5 * (lo + hi) - z[k0];
    }
    s0 = std::max(s0, min_gap_nm - z_lo);

    Eigen::Vector3d p(phi0, s0, 0.0);  // φ̄ (eV), s0 (nm), a
    // a from the mean residual at the start.
    auto grid_at = [&](double phi, double off) {
        return ln_current_grid(c, phi, z_lo + off, z_hi + off, m, bias, r.model_evaluations);
    };
    auto residuals = [&](const Eigen::Vector3d& q, const ln_current_grid& g) {
        Eigen::VectorXd res(static_cast<Eigen::Index>(n));
        for (std::size_t k = 0; k < n; ++k) res[static_cast<Eigen::Index>(k)] = sw[k] * (y[k] - q[2] - g(z[k] + q[1]));
        return res;
    };
    {
        const ln_current_grid g = grid_at(p[0], p[1]);
        double sum = 0, wsum = 0;
        for (std::size_t k = 0; k < n; ++k) {
            sum += sw[k] * sw[k] * (y[k] - g(z[k] + p[1]));
            wsum += sw[k] * sw[k];
        }
        p[2] = sum / wsum;
    }

    const double h_phi = opt.work_function_step_J / eV;
    auto jacobian = [&](const Eigen::Vector3d& q, const ln_current_grid& g) {
        const ln_current_grid gp = grid_at(q[0] + h_phi, q[1]), gm = grid_at(q[0] - h_phi, q[1]);
        Eigen::MatrixXd J(static_cast<Eigen::Index>(n), 3);
        for (std::size_t k = 0; k < n; ++k) {
            const auto row = static_cast<Eigen::Index>(k);
            const double s = z[k] + q[1];
            J(row, 0) = -sw[k] * (gp(s) - gm(s)) / (2.0 * h_phi);
            J(row, 1) = -sw[k] * g.prime(s);
            J(row, 2) = -sw[k];
        }
        return J;
    };

    ln_current_grid g = grid_at(p[0], p[1]);
    Eigen::VectorXd res = residuals(p, g);
    double cost = res.squaredNorm();
    double lambda = 1e-3;
    bool converged = false;
    Eigen::MatrixXd J = jacobian(p, g);
    int it = 0;
    for (; it < opt.max_iterations && !converged; ++it) {
        const Eigen::Matrix3d A = J.transpose() * J;
        const Eigen::Vector3d b = -J.transpose() * res;
        bool accepted = false;
        for (int tries = 0; tries < 12 && !accepted; ++tries) {
            Eigen::Matrix3d D = A;
            for (int d = 0; d < 3; ++d) D(d, d) += lambda * std::max(A(d, d), 1e-30);
            const Eigen::Vector3d step = D.ldlt().solve(b);
            Eigen::Vector3d q = p + step;
            q[0] = std::clamp(q[0], min_work_function_eV, max_work_function_eV);
            q[1] = std::max(q[1], min_gap_nm - z_lo);
            const ln_current_grid gq = grid_at(q[0], q[1]);
            const Eigen::VectorXd rq = residuals(q, gq);
            const double cq = rq.squaredNorm();
            if (cq <= cost) {
                const double rel = cost > 0 ? (cost - cq) / cost : 0.0;
                const Eigen::Vector3d dq = q - p;
                p = q;
                g = gq;
                res = rq;
                cost = cq;
                accepted = true;
                lambda = std::max(lambda / 3.0, 1e-12);
                converged = (rel < cost_rtol || cq == 0.0) && std::abs(dq[0]) < step_tol && std::abs(dq[1]) < step_tol;
                if (!converged) J = jacobian(p, g);
            } else {
                lambda *= 4.0;
            }
        }
        if (!accepted) {
            // No downhill step at any damping: the minimum to the model's own accuracy.
            converged = true;
        }
    }
    r.iterations = it;
    r.status = converged ? fit_status::converged : fit_status::not_converged;
    r.message = converged ? "converged" : fmt::format("stopped after {} iterations", it);
    if (!converged) r.warnings.push_back("the model fit did not converge: " + r.message);
    if (p[1] <= min_gap_nm - z_lo + 1e-9)
        r.warnings.push_back(fmt::format("the gap offset sits at its lower bound (closest gap {} nm)", min_gap_nm));

    // Covariance s² (JᵀJ)⁻¹ with s² = Σ w r² / (n - 3), as the linear fit (residual-scaled).
    J = jacobian(p, g);
    const double dof = static_cast<double>(n) - 3.0;
    const double s2 = cost / dof;
    const Eigen::Matrix3d cov = (J.transpose() * J).inverse() * s2;
    r.mean_work_function_J = p[0] * eV;
    r.mean_work_function_stderr_J = std::sqrt(std::max(cov(0, 0), 0.0)) * eV;
    r.gap_offset_m = p[1] * nm;
    r.gap_offset_stderr_m = std::sqrt(std::max(cov(1, 1), 0.0)) * nm;
    r.ln_prefactor = p[2];
    r.ln_prefactor_stderr = std::sqrt(std::max(cov(2, 2), 0.0));
    r.correlation_work_function_gap = cov(0, 0) > 0 && cov(1, 1) > 0 ? cov(0, 1) / std::sqrt(cov(0, 0) * cov(1, 1)) : 0.0;
    const double half_diff = 0.5 * (c.model.tip.work_function_J - c.model.sample.work_function_J);
    r.tip_work_function_J = r.mean_work_function_J + half_diff;
    r.sample_work_function_J = r.mean_work_function_J - half_diff;
    r.t_quantile = boost::math::quantile(boost::math::students_t(dof), 0.5 + 0.5 * opt.confidence_level);

    // Fitted curve, its RMS and its own slope over the used points (same weights as the data fit).
    std::vector<std::size_t> order(n);
    for (std::size_t k = 0; k < n; ++k) order[k] = k;
    std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return z[a] < z[b]; });
    std::vector<double> zs, ls, ws;
    double ss = 0.0;
    for (std::size_t k : order) {
        const double fit = p[2] + g(z[k] + p[1]);
        r.z_m.push_back(z[k] * nm);
        r.ln_current_fit.push_back(fit);
        ss += (y[k] - fit) * (y[k] - fit);
        zs.push_back(z[k] * nm);
        ls.push_back(fit);
        ws.push_back(sw[k] * sw[k]);
    }
    r.residual_rms_ln = std::sqrt(ss / static_cast<double>(n));
    r.model_apparent_barrier_J = apparent_barrier_from_decay(-0.5 * fit_line(zs, ls, ws).slope);
    r.data_apparent_barrier_J = linear.apparent_barrier_J;
    r.gap_min_m = (z_lo + p[1]) * nm;
    r.gap_max_m = (z_hi + p[1]) * nm;
    if (std::abs(r.correlation_work_function_gap) > 0.99) {
        r.warnings.push_back(fmt::format(
            "the work function and the gap offset are strongly correlated ({:.3f}): the curvature of ln|I| that "
            "separates them is weak over this range",
            r.correlation_work_function_gap));
    }
    return r;
}

}  // namespace tipgap
