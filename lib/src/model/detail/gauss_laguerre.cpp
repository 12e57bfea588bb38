#include "model/detail/gauss_laguerre.hpp"

#include <Eigen/Eigenvalues>
#include <array>
#include <cmath>
#include <mutex>
#include <stdexcept>

namespace tipgap::detail {
namespace {

// L_n(x) and L_n'(x) by the three-term recurrence (k + 1) L_{k+1} = (2k + 1 - x) L_k - k L_{k-1}
// and x L_n' = n (L_n - L_{n-1}) (A&S 22.7.12 and 22.8.6).
void laguerre(int n, long double x, long double& value, long double& derivative) {
    long double p0 = 1.0L, p1 = 1.0L - x;
    if (n == 0) {
        value = 1.0L;
        derivative = 0.0L;
        return;
    }
    for (int k = 1; k < n; ++k) {
        const long double p2 = ((2 * k + 1 - x) * p1 - k * p0) / (k + 1);
        p0 = p1;
        p1 = p2;
    }
    value = p1;
    derivative = n * (p1 - p0) / x;
}

gauss_laguerre_rule make_rule(int n) {
    Eigen::VectorXd diagonal(n), sub(std::max(n - 1, 1));
    for (int k = 0; k < n; ++k) diagonal[k] = 2.0 * k + 1.0;
    for (int k = 1; k < n; ++k) sub[k - 1] = k;
    Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> solver;
    solver.computeFromTridiagonal(diagonal, sub.head(n - 1), Eigen::EigenvaluesOnly);
    gauss_laguerre_rule r;
    for (int i = 0; i < n; ++i) {
        long double x = solver.eigenvalues()[i], value = 0, derivative = 0;
        // The eigenvalues are good to ~1e-15 of the largest node; three Newton steps in long
        // double make every node correct to the last bit of a double.
        for (int step = 0; step < 3; ++step) {
            laguerre(n, x, value, derivative);
            x -= value / derivative;
        }
        laguerre(n, x, value, derivative);
        const long double w = 1.0L / (x * derivative * derivative);
        r.nodes.push_back(static_cast<double>(x));
        r.weights.push_back(static_cast<double>(w));
        r.scaled_weights.push_back(static_cast<double>(w * std::exp(x)));
    }
    return r;
}

}  // namespace

const gauss_laguerre_rule& gauss_laguerre(int n) {
    constexpr int kMax = 64;
    if (n < 1 || n > kMax) throw std::invalid_argument("gauss_laguerre: n must be in [1, 64]");
    static std::array<gauss_laguerre_rule, kMax + 1> rules;
    static std::array<std::once_flag, kMax + 1> once;
    std::call_once(once[n], [n] { rules[n] = make_rule(n); });
    return rules[n];
}

}  // namespace tipgap::detail
