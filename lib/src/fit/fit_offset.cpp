// Nonlinear least squares I = a exp(-b (z - z_ref) - q (z - z_ref)²) + c (q = 0 unless the
// curvature term is asked for) by Levenberg-Marquardt (Eigen's MINPACK port, Moré, Springer LNM
// 630 (1978) 105), with the covariance (JᵀWJ)⁻¹ from an SVD of the weighted Jacobian at the
// solution: absolute when the weights are 1/σ² from a noise model, scaled by s² = SSR/(n - p)
// without weights (as scipy.optimize.curve_fit with absolute_sigma=False).
#include <Eigen/SVD>
#include <cmath>
#include <limits>
#include <unsupported/Eigen/NonLinearOptimization>

#include "fit/detail/fit_internal.hpp"

namespace tipgap::detail {
namespace {

// The problem is solved in scaled variables x = (z - z_ref)/length_scale and y = I/current_scale,
// so that the parameters are O(1) and MINPACK's tolerances mean the same for every curve.
// sw: square roots of the weights in scaled units (all 1 without weights).
struct offset_functor {
    using Scalar = double;
    enum { InputsAtCompileTime = Eigen::Dynamic, ValuesAtCompileTime = Eigen::Dynamic };
    using InputType = Eigen::VectorXd;
    using ValueType = Eigen::VectorXd;
    using JacobianType = Eigen::MatrixXd;

    const Eigen::VectorXd& x;
    const Eigen::VectorXd& y;
    const Eigen::VectorXd& sw;
    bool quadratic = false;
    bool fixed_offset = false;  // c = c_fixed, parameters (a, b) only
    double c_fixed = 0.0;

    int inputs() const { return fixed_offset ? 2 : quadratic ? 4 : 3; }
    double offset(const Eigen::VectorXd& p) const { return fixed_offset ? c_fixed : p(2); }
    int values() const { return static_cast<int>(x.size()); }
    Eigen::ArrayXd shape(const Eigen::VectorXd& p) const {
        Eigen::ArrayXd e = -p(1) * x.array();
        if (quadratic) e -= p(3) * x.array().square();
        return e.exp();
    }
    int operator()(const Eigen::VectorXd& p, Eigen::VectorXd& f) const {
        f = ((p(0) * shape(p) + offset(p) - y.array()) * sw.array()).matrix();
        return 0;
    }
    int df(const Eigen::VectorXd& p, Eigen::MatrixXd& j) const {
        const Eigen::ArrayXd e = shape(p);
        j.col(0) = (e * sw.array()).matrix();
        j.col(1) = (-p(0) * x.array() * e * sw.array()).matrix();
        if (!fixed_offset) j.col(2) = sw;
        if (quadratic) j.col(3) = (-p(0) * x.array().square() * e * sw.array()).matrix();
        return 0;
    }
};

// MINPACK stops when a relative change falls below these; 1e-14 is ~50 ulp, well past the
// statistical precision and tight enough to agree with SciPy's MINPACK run to 1e-6.
constexpr double lm_tolerance = 1e-14;

std::string lm_message(Eigen::LevenbergMarquardtSpace::Status status) {
    using namespace Eigen::LevenbergMarquardtSpace;
    switch (status) {
        case RelativeReductionTooSmall: return "relative reduction of the sum of squares below tolerance";
        case RelativeErrorTooSmall: return "relative change of the parameters below tolerance";
        case RelativeErrorAndReductionTooSmall: return "parameters and sum of squares converged";
        case CosinusTooSmall: return "residuals orthogonal to the Jacobian";
        case TooManyFunctionEvaluation: return "iteration limit reached";
        case FtolTooSmall:
        case XtolTooSmall:
        case GtolTooSmall: return "converged to machine precision";
        default: return "improper input to Levenberg-Marquardt";
    }
}

}  // namespace

offset_fit fit_offset_model(const offset_problem& pb) {
    const auto n = static_cast<Eigen::Index>(pb.z_m.size());
    // Length scale: 1/b0 makes the rate O(1); current scale: the starting amplitude.
    const double length_scale = pb.b0_per_m > 0 ? 1.0 / pb.b0_per_m : 1e-10;
    const double current_scale = std::abs(pb.a0_A) > 0 ? std::abs(pb.a0_A) : 1.0;
    const bool weighted = !pb.weights.empty();
    Eigen::VectorXd x(n), y(n), sw(n);
    for (Eigen::Index i = 0; i < n; ++i) {
        const auto k = static_cast<std::size_t>(i);
        x(i) = (pb.z_m[k] - pb.z_ref_m) / length_scale;
        y(i) = pb.signed_current_A[k] / current_scale;
        sw(i) = weighted ? std::sqrt(pb.weights[k]) * current_scale : 1.0;
    }
    offset_functor f{x, y, sw, pb.quadratic && !pb.fixed_offset, pb.fixed_offset, pb.c0_A / current_scale};
    const int np = f.inputs();
    Eigen::VectorXd p(np);
    p(0) = pb.a0_A / current_scale;
    p(1) = pb.b0_per_m * length_scale;
    if (!pb.fixed_offset) p(2) = pb.c0_A / current_scale;
    if (pb.quadratic) p(3) = 0.0;
    Eigen::LevenbergMarquardt<offset_functor> lm(f);
    lm.parameters.ftol = lm_tolerance;
    lm.parameters.xtol = lm_tolerance;
    lm.parameters.maxfev = pb.max_evaluations;
    const auto status = lm.minimize(p);

    offset_fit out;
    out.evaluations = static_cast<int>(lm.nfev);
    using namespace Eigen::LevenbergMarquardtSpace;
    out.converged = status != TooManyFunctionEvaluation && status != ImproperInputParameters && status != UserAsked;
    out.message = lm_message(status);

    Eigen::VectorXd r(n);
    f(p, r);
    Eigen::MatrixXd j(n, np);
    f.df(p, j);
    const double ssr = r.squaredNorm();
    const double dof = static_cast<double>(n - np);
    const double s2 = weighted ? 1.0 : (dof > 0 ? ssr / dof : 0.0);
    Eigen::JacobiSVD<Eigen::MatrixXd> svd(j, Eigen::ComputeThinU | Eigen::ComputeThinV);
    const Eigen::VectorXd sv = svd.singularValues();
    Eigen::VectorXd inv2(np);
    for (int k = 0; k < np; ++k) inv2(k) = sv(k) > 0 ? 1.0 / (sv(k) * sv(k)) : std::numeric_limits<double>::infinity();
    const Eigen::MatrixXd cov = svd.matrixV() * inv2.asDiagonal() * svd.matrixV().transpose() * s2;

    out.amplitude_A = p(0) * current_scale;
    out.amplitude_stderr_A = std::sqrt(cov(0, 0)) * current_scale;
    out.rate_per_m = p(1) / length_scale;
    out.rate_stderr_per_m = std::sqrt(cov(1, 1)) / length_scale;
    out.offset_A = f.offset(p) * current_scale;
    out.offset_stderr_A = pb.fixed_offset ? 0.0 : std::sqrt(cov(2, 2)) * current_scale;
    if (f.quadratic) {
        out.curvature_per_m2 = p(3) / (length_scale * length_scale);
        out.curvature_stderr_per_m2 = std::sqrt(cov(3, 3)) / (length_scale * length_scale);
    }
    const double unit[3] = {current_scale, 1.0 / length_scale, current_scale};
    out.covariance.resize(9);
    for (int a = 0; a < 3; ++a)  // a held offset has no variance: its row and column are 0
        for (int b = 0; b < 3; ++b)
            out.covariance[static_cast<std::size_t>(3 * a + b)] = a < np && b < np ? cov(a, b) * unit[a] * unit[b] : 0.0;
    // Leverages h_i = Σ_k U_ik² over the non-zero singular values (the hat matrix's diagonal).
    out.leverage.assign(static_cast<std::size_t>(n), 0.0);
    for (Eigen::Index i = 0; i < n; ++i)
        for (int k = 0; k < np; ++k)
            if (sv(k) > 0) out.leverage[static_cast<std::size_t>(i)] += svd.matrixU()(i, k) * svd.matrixU()(i, k);
    // Unweighted: SSR in A²; weighted: χ² = Σ w r² (dimensionless).
    out.ssr = weighted ? ssr : ssr * current_scale * current_scale;
    return out;
}

}  // namespace tipgap::detail
