#pragma once
// The WKB exponent theta(E) of one barrier, tabulated once as a Chebyshev interpolant and reused at
// every energy node of the current integral; optionally also its gap and bias derivatives.
#include "model/detail/chebyshev.hpp"
#include "model/detail/exponent_sample.hpp"
#include "tipgap/model/barrier.hpp"

namespace tipgap::detail {

// theta(E) does not depend on the supply function, and it is analytic in E below the barrier top,
// so it is sampled once per barrier at Chebyshev-Lobatto energies (doubling the node count until
// the interpolant predicts the new nodes to within tol) and the energy integral then runs on the
// interpolant: ~33 barrier integrals per J instead of one per quadrature node. Without an image
// potential theta has a closed form and is evaluated directly.
class exponent_table {
public:
    // Table on [e_lo, e_hi] (J) to absolute accuracy tol in theta. derivatives: also tabulate
    // d theta/ds and d theta/dV on the same nodes, each to relative accuracy tol; the node count
    // may then grow further for them, but theta's own interpolant (and so J) stays the one chosen
    // by theta's criterion. The barrier must outlive the table.
    exponent_table(const barrier& b, double e_lo, double e_hi, double tol, bool derivatives);

    // D(E) = exp(-theta(E)), 1 at and above the barrier top.
    double transmission(double E_J) const;

    // theta (>= 0) and, when built with derivatives, its derivatives at E_J; zero above the top.
    exponent_sample sample(double E_J) const;

private:
    exponent_sample node_value(double E_J) const;
    static constexpr int kMaxNodes = 256;
    const barrier& b_;
    double lo_, hi_, tol_;
    bool derivatives_;
    bool direct_ = false;
    chebyshev_interpolant fit_, fit_ds_, fit_dV_;
};

}  // namespace tipgap::detail
