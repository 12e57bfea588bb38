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
    if (!(confidence_level >= 0.5 && confidence_level <= 0.9999)) bad("confidence_level", "must be in [0.5, 0.9999]");
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

// The points of the linear fit in the model fit's units: z in nm, ln|I|, and √w = Î/σ from the
// linear fit's current, normalised to the largest (only ratios matter: the covariance is scaled
// by the residual variance).
struct model_points {
    std::vector<double> z, y, sw;
    double z_lo = 0.0, z_hi = 0.0;  // nm

    model_points(const curve_sweep& sweep, const fit_result& linear) {
        const std::size_t n = linear.used_rows.size();
        z.resize(n);
        y.resize(n);
        sw.resize(n);
        for (std::size_t k = 0; k < n; ++k) {
            const std::size_t i = linear.used_rows[k];
            z[k] = sweep.z_m[i] / nm;
            y[k] = std::log(std::abs(sweep.current_A[i]));
            sw[k] = std::exp(linear.line.intercept + linear.line.slope * sweep.z_m[i]);
        }
        const double sw_max = *std::max_element(sw.begin(), sw.end());
        for (double& v : sw) v /= sw_max;
        z_lo = *std::min_element(z.begin(), z.end());
        z_hi = *std::max_element(z.begin(), z.end());
    }
    std::size_t size() const { return z.size(); }
};

// The least-squares problem in p = (φ̄ in eV, s0 in nm, a): residuals √w (ln|I| - a - ln|I_model|)
// and their Jacobian, with ln|I_model| from a spline grid per parameter set.
class model_problem {
public:
    model_problem(const config& c, const model_points& pts, const model_fit_options& opt, double bias_V, int& evaluations)
        : c_(c), pts_(pts), m_(opt.grid_points), bias_(bias_V), h_phi_(opt.work_function_step_J / eV),
          evaluations_(evaluations) {}

    ln_current_grid grid_at(double phi, double off) const {
        return ln_current_grid(c_, phi, pts_.z_lo + off, pts_.z_hi + off, m_, bias_, evaluations_);
    }
    Eigen::VectorXd residuals(const Eigen::Vector3d& q, const ln_current_grid& g) const {
        const std::size_t n = pts_.size();
        Eigen::VectorXd res(static_cast<Eigen::Index>(n));
        for (std::size_t k = 0; k < n; ++k)
            res[static_cast<Eigen::Index>(k)] = pts_.sw[k] * (pts_.y[k] - q[2] - g(pts_.z[k] + q[1]));
        return res;
    }
    // φ̄ by central differences of two grids, s0 from the spline's derivative, a exactly.
    Eigen::MatrixXd jacobian(const Eigen::Vector3d& q, const ln_current_grid& g) const {
        const ln_current_grid gp = grid_at(q[0] + h_phi_, q[1]), gm = grid_at(q[0] - h_phi_, q[1]);
        const std::size_t n = pts_.size();
        Eigen::MatrixXd J(static_cast<Eigen::Index>(n), 3);
        for (std::size_t k = 0; k < n; ++k) {
            const auto row = static_cast<Eigen::Index>(k);
            const double s = pts_.z[k] + q[1];
            J(row, 0) = -pts_.sw[k] * (gp(s) - gm(s)) / (2.0 * h_phi_);
            J(row, 1) = -pts_.sw[k] * g.prime(s);
            J(row, 2) = -pts_.sw[k];
        }
        return J;
    }
    // a from the mean weighted residual at (φ̄, s0).
    double mean_prefactor(double phi, double off) const {
        const ln_current_grid g = grid_at(phi, off);
        double sum = 0, wsum = 0;
        for (std::size_t k = 0; k < pts_.size(); ++k) {
            sum += pts_.sw[k] * pts_.sw[k] * (pts_.y[k] - g(pts_.z[k] + off));
            wsum += pts_.sw[k] * pts_.sw[k];
        }
        return sum / wsum;
    }
    const model_points& points() const { return pts_; }

private:
    const config& c_;
    const model_points& pts_;
    std::size_t m_;
    double bias_;
    double h_phi_;
    int& evaluations_;
};

// Starting gap offset (nm): the option, else a contact's, else where the model with the config's
// area carries the measured current at the closest used point (bisection on the monotonic
// ln|I(s)|); never below the smallest meaningful gap.
double starting_gap_offset(const config& c, const model_points& pts, const fit_result& linear,
                           const model_fit_options& opt, double phi0, double bias, int& evaluations) {
    double s0 = opt.initial_gap_offset_m / nm;
    if (std::isnan(s0) && linear.contact.kind != contact_kind::none) s0 = linear.contact.gap_offset_m / nm;
    if (std::isnan(s0)) {
        const std::size_t k0 = static_cast<std::size_t>(std::min_element(pts.z.begin(), pts.z.end()) - pts.z.begin());
        const config c0 = with_mean_work_function(c, phi0 * eV);
        double lo = min_gap_nm, hi = 3.0;
        const double target = pts.y[k0];
        for (int it = 0; it < 40; ++it) {
            const double mid = 0.5 * (lo + hi);
            const double v = std::log(std::abs(total_current(c0.model, c0.geometry, mid * nm, bias)));
            ++evaluations;
            (v > target ? lo : hi) = mid;
        }
        s0 = 0.5 * (lo + hi) - pts.z[k0];
    }
    return std::max(s0, min_gap_nm - pts.z_lo);
}

struct lm_outcome {
    Eigen::Vector3d p;          // φ̄ (eV), s0 (nm), a
    ln_current_grid g;          // the model grid at p
    double cost = 0.0;          // Σ w r² at p
    int iterations = 0;
    bool converged = false;
};

// Levenberg-Marquardt (Marquardt, J. SIAM 11, 431 (1963)) from p0, with φ̄ and s0 kept in range.
lm_outcome levenberg_marquardt(const model_problem& prob, const Eigen::Vector3d& p0, int max_iterations) {
    const double z_lo = prob.points().z_lo;
    Eigen::Vector3d p = p0;
    ln_current_grid g = prob.grid_at(p[0], p[1]);
    Eigen::VectorXd res = prob.residuals(p, g);
    double cost = res.squaredNorm();
    double lambda = 1e-3;
    bool converged = false;
    Eigen::MatrixXd J = prob.jacobian(p, g);
    int it = 0;
    for (; it < max_iterations && !converged; ++it) {
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
            const ln_current_grid gq = prob.grid_at(q[0], q[1]);
            const Eigen::VectorXd rq = prob.residuals(q, gq);
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
                if (!converged) J = prob.jacobian(p, g);
            } else {
                lambda *= 4.0;
            }
        }
        // No downhill step at any damping: the minimum to the model's own accuracy.
        if (!accepted) converged = true;
    }
    return lm_outcome{p, g, cost, it, converged};
}

// Parameters, their covariance s² (JᵀJ)⁻¹ with s² = Σ w r² / (n - 3) (residual-scaled, as the
// linear fit) and the t quantile.
void record_parameters(model_fit_result& r, const config& c, const model_problem& prob, const lm_outcome& lm,
                       double confidence_level) {
    const Eigen::Vector3d& p = lm.p;
    const Eigen::MatrixXd J = prob.jacobian(p, lm.g);
    const double dof = static_cast<double>(prob.points().size()) - 3.0;
    const double s2 = lm.cost / dof;
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
    r.t_quantile = boost::math::quantile(boost::math::students_t(dof), 0.5 + 0.5 * confidence_level);
}

// Fitted curve, its RMS and its own slope over the used points (same weights as the data fit).
void record_fitted_curve(model_fit_result& r, const model_points& pts, const lm_outcome& lm) {
    const Eigen::Vector3d& p = lm.p;
    const std::size_t n = pts.size();
    std::vector<std::size_t> order(n);
    for (std::size_t k = 0; k < n; ++k) order[k] = k;
    std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return pts.z[a] < pts.z[b]; });
    std::vector<double> zs, ls, ws;
    double ss = 0.0;
    for (std::size_t k : order) {
        const double fit = p[2] + lm.g(pts.z[k] + p[1]);
        r.z_m.push_back(pts.z[k] * nm);
        r.ln_current_fit.push_back(fit);
        ss += (pts.y[k] - fit) * (pts.y[k] - fit);
        zs.push_back(pts.z[k] * nm);
        ls.push_back(fit);
        ws.push_back(pts.sw[k] * pts.sw[k]);
    }
    r.residual_rms_ln = std::sqrt(ss / static_cast<double>(n));
    r.model_apparent_barrier_J = apparent_barrier_from_decay(-0.5 * fit_line(zs, ls, ws).slope);
    r.gap_min_m = (pts.z_lo + p[1]) * nm;
    r.gap_max_m = (pts.z_hi + p[1]) * nm;
}

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
    const model_points pts(sweep, linear);
    r.points_used = n;
    const double phi0 = 0.5 * (c.model.tip.work_function_J + c.model.sample.work_function_J) / eV;
    const double s0 = starting_gap_offset(c, pts, linear, opt, phi0, bias_V, r.model_evaluations);
    const model_problem prob(c, pts, opt, bias_V, r.model_evaluations);
    const Eigen::Vector3d p0(phi0, s0, prob.mean_prefactor(phi0, s0));

    const lm_outcome lm = levenberg_marquardt(prob, p0, opt.max_iterations);
    r.iterations = lm.iterations;
    r.status = lm.converged ? fit_status::converged : fit_status::not_converged;
    r.message = lm.converged ? "converged" : fmt::format("stopped after {} iterations", lm.iterations);
    if (!lm.converged) r.warnings.push_back("the model fit did not converge: " + r.message);
    if (lm.p[1] <= min_gap_nm - pts.z_lo + 1e-9)
        r.warnings.push_back(fmt::format("the gap offset sits at its lower bound (closest gap {} nm)", min_gap_nm));

    record_parameters(r, c, prob, lm, opt.confidence_level);
    record_fitted_curve(r, pts, lm);
    r.data_apparent_barrier_J = linear.apparent_barrier_J;
    if (std::abs(r.correlation_work_function_gap) > 0.99) {
        r.warnings.push_back(fmt::format(
            "the work function and the gap offset are strongly correlated ({:.3f}): the curvature of ln|I| that "
            "separates them is weak over this range",
            r.correlation_work_function_gap));
    }
    return r;
}

}  // namespace tipgap
