#pragma once
// Local least-squares polynomials on a window of a sampled trace: the smoothing derivative of a
// Savitzky-Golay filter (Savitzky & Golay 1964, Anal. Chem. 36, 1627), written for uneven spacing
// as one least-squares fit per window, with the covariance of the coefficients for error
// propagation.
#include <Eigen/Dense>
#include <cmath>
#include <vector>

namespace tipgap::detail {

struct local_polynomial {
    double x0 = 0, half_width = 1;  // centre and scale: the polynomial is in t = (x - x0)/half_width
    Eigen::VectorXd c;              // coefficients of t^0 .. t^degree
    Eigen::MatrixXd inverse_normal; // (A^T A)^-1: covariance of c per unit noise variance
    Eigen::MatrixXd hat;            // (A^T A)^-1 A^T: c = hat y
    double rss = 0;                 // residual sum of squares
    int points = 0;

    // d^k/dx^k of the polynomial at x.
    double derivative(int k, double x) const {
        const double t = (x - x0) / half_width;
        double sum = 0.0;
        for (int j = static_cast<int>(c.size()) - 1; j >= k; --j) {
            double f = 1.0;
            for (int i = 0; i < k; ++i) f *= j - i;
            sum += f * c(j) * std::pow(t, j - k);
        }
        return sum / std::pow(half_width, k);
    }
    // Gradient of derivative(k, x) with respect to c.
    Eigen::VectorXd derivative_gradient(int k, double x) const {
        const double t = (x - x0) / half_width;
        Eigen::VectorXd g = Eigen::VectorXd::Zero(c.size());
        for (int j = k; j < c.size(); ++j) {
            double f = 1.0;
            for (int i = 0; i < k; ++i) f *= j - i;
            g(j) = f * std::pow(t, j - k) / std::pow(half_width, k);
        }
        return g;
    }
};

// Fits a polynomial of `degree` to the samples with |x - x0| <= half_width. Returns points = 0 when
// the window holds no more than degree + 1 samples.
inline local_polynomial fit_local_polynomial(const std::vector<double>& x, const std::vector<double>& y, double x0,
                                             double half_width, int degree) {
    local_polynomial p;
    p.x0 = x0;
    p.half_width = half_width;
    std::vector<int> in;
    for (int i = 0; i < static_cast<int>(x.size()); ++i) {
        if (std::abs(x[i] - x0) <= half_width * (1.0 + 1e-12)) in.push_back(i);
    }
    if (static_cast<int>(in.size()) <= degree + 1) return p;
    const int m = static_cast<int>(in.size()), n = degree + 1;
    Eigen::MatrixXd A(m, n);
    Eigen::VectorXd b(m);
    for (int r = 0; r < m; ++r) {
        const double t = (x[in[r]] - x0) / half_width;
        double power = 1.0;
        for (int j = 0; j < n; ++j, power *= t) A(r, j) = power;
        b(r) = y[in[r]];
    }
    p.inverse_normal = (A.transpose() * A).inverse();
    p.hat = p.inverse_normal * A.transpose();
    p.c = p.hat * b;
    p.rss = (A * p.c - b).squaredNorm();
    p.points = m;
    return p;
}

}  // namespace tipgap::detail
