// Nonlinear least squares I = a exp(-b (z - z_ref)) + c by Levenberg-Marquardt (Eigen's MINPACK
// port, Moré, Springer LNM 630 (1978) 105), with the covariance s² (JᵀJ)⁻¹ from an
// SVD of the Jacobian at the solution, s² = SSR/(n - 3) (as scipy.optimize.curve_fit with
// absolute_sigma=False).
#include <Eigen/SVD>
#include <cmath>
#include <unsupported/Eigen/NonLinearOptimization>

#include "fit/detail/fit_internal.hpp"

namespace tipgap::detail {
namespace {

// The problem is solved in scaled variables x = (z - z_ref)/length_scale and y = I/current_scale,
// so that the three parameters are O(1) and MINPACK's tolerances mean the same for every curve.
struct offset_functor {
    using Scalar = double;
    enum { InputsAtCompileTime = Eigen::Dynamic, ValuesAtCompileTime = Eigen::Dynamic };
    using InputType = Eigen::VectorXd;
    using ValueType = Eigen::VectorXd;
    using JacobianType = Eigen::MatrixXd;

    const Eigen::VectorXd& x;
    const Eigen::VectorXd& y;

    int inputs() const { return 3; }
    int values() const { return static_cast<int>(x.size()); }
    int operator()(const Eigen::VectorXd& p, Eigen::VectorXd& f) const {
        f = (p(0) * (-p(1) * x.array()).exp() + p(2) - y.array()).matrix();
        return 0;
    }
    int df(const Eigen::VectorXd& p, Eigen::MatrixXd& j) const {
        const Eigen::ArrayXd e = (-p(1) * x.array()).exp();
        j.col(0) = e.matrix();
        j.col(1) = (-p(0) * x.array() * e).matrix();
        j.col(2).setOnes();
        return 0;
    }
};

// MINPACK stops when a relative change falls below these; 1e-14 is ~50 ulp, well past the
// statistical precision and tight enough to agree with SciPy's MINPACK run to 1e-6.
constexpr double lm_tolerance = 1e-14;

}  // namespace

offset_fit fit_offset_model(std::span<const double> z_m, std::span<const double> signed_current_A, double z_ref_m,
                            double a0_A, double b0_per_m, double c0_A, int max_evaluations) {
    const auto n = static_cast<Eigen::Index>(z_m.size());
    // Length scale: 1/b0 makes the rate O(1); current scale: the starting amplitude.
    const double length_scale = b0_per_m > 0 ? 1.0 / b0_per_m : 1e-10;
    const double current_scale = std::abs(a0_A) > 0 ? std::abs(a0_A) : 1.0;
    Eigen::VectorXd x(n), y(n);
    for (Eigen::Index i = 0; i < n; ++i) {
        x(i) = (z_m[static_cast<std::size_t>(i)] - z_ref_m) / length_scale;
        y(i) = signed_current_A[static_cast<std::size_t>(i)] / current_scale;
    }
    offset_functor f{x, y};
    Eigen::VectorXd p(3);
    p << a0_A / current_scale, b0_per_m * length_scale, c0_A / current_scale;
    Eigen::LevenbergMarquardt<offset_functor> lm(f);
    lm.parameters.ftol = lm_tolerance;
    lm.parameters.xtol = lm_tolerance;
    lm.parameters.maxfev = max_evaluations;
    const auto status = lm.minimize(p);

    offset_fit out;
    out.evaluations = static_cast<int>(lm.nfev);
    using namespace Eigen::LevenbergMarquardtSpace;
    out.converged = status != TooManyFunctionEvaluation && status != ImproperInputParameters && status != UserAsked;
    switch (status) {
        case RelativeReductionTooSmall: out.message = "relative reduction of the sum of squares below tolerance"; break;
        case RelativeErrorTooSmall: out.message = "relative change of the parameters below tolerance"; break;
        case RelativeErrorAndReductionTooSmall: out.message = "parameters and sum of squares converged"; break;
        case CosinusTooSmall: out.message = "residuals orthogonal to the Jacobian"; break;
        case TooManyFunctionEvaluation: out.message = "iteration limit reached"; break;
        case FtolTooSmall:
        case XtolTooSmall:
        case GtolTooSmall: out.message = "converged to machine precision"; break;
        default: out.message = "improper input to Levenberg-Marquardt"; break;
    }

    Eigen::VectorXd r(n);
    f(p, r);
    Eigen::MatrixXd j(n, 3);
    f.df(p, j);
    const double ssr = r.squaredNorm();
    const double dof = static_cast<double>(n) - 3.0;
    const double s2 = dof > 0 ? ssr / dof : 0.0;
    Eigen::JacobiSVD<Eigen::MatrixXd> svd(j, Eigen::ComputeThinV);
    const Eigen::VectorXd sv = svd.singularValues();
    Eigen::VectorXd inv2(3);
    for (int k = 0; k < 3; ++k) inv2(k) = sv(k) > 0 ? 1.0 / (sv(k) * sv(k)) : std::numeric_limits<double>::infinity();
    const Eigen::MatrixXd cov = svd.matrixV() * inv2.asDiagonal() * svd.matrixV().transpose() * s2;

    out.amplitude_A = p(0) * current_scale;
    out.amplitude_stderr_A = std::sqrt(cov(0, 0)) * current_scale;
    out.rate_per_m = p(1) / length_scale;
    out.rate_stderr_per_m = std::sqrt(cov(1, 1)) / length_scale;
    out.offset_A = p(2) * current_scale;
    out.offset_stderr_A = std::sqrt(cov(2, 2)) * current_scale;
    out.ssr_A2 = ssr * current_scale * current_scale;
    return out;
}

}  // namespace tipgap::detail
