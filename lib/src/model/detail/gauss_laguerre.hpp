#pragma once
// Gauss-Laguerre rules: ∫_0^inf e^(-t) g(t) dt ≈ sum w_i g(t_i), exact for polynomials g of degree
// <= 2n - 1 (Abramowitz & Stegun 1964, eq. 25.4.45). Boost.Math 1.74 has no Laguerre node table, so
// the nodes are computed once per n by the Golub-Welsch method (Golub & Welsch 1969, Math. Comp.
// 23, 221): they are the eigenvalues of the symmetric tridiagonal Jacobi matrix of the Laguerre
// recurrence (diagonal 2k + 1, off-diagonal k), found with Eigen, then each polished by Newton steps
// on L_n in long double. The weights come from w_i = 1 / (t_i L_n'(t_i)^2) (A&S 25.4.45), which is
// accurate to a few ulp even for the tiny weights of the far nodes, where the eigenvector formula
// of Golub & Welsch loses all relative accuracy.
#include <vector>

namespace tipgap::detail {

struct gauss_laguerre_rule {
    std::vector<double> nodes;           // t_i, ascending
    std::vector<double> weights;         // w_i
    std::vector<double> scaled_weights;  // w_i e^(t_i): the rule for ∫_0^inf f(t) dt ≈ sum w_i e^(t_i) f(t_i)
};

// The n-point rule, n in [1, 64]; computed on first use and cached (thread-safe).
const gauss_laguerre_rule& gauss_laguerre(int n);

}  // namespace tipgap::detail
