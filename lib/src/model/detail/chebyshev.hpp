#pragma once
// Chebyshev interpolation on [a, b] at Chebyshev-Lobatto points x_j = cos(pi j / n), j = 0..n.
// Doubling n reuses every earlier node, so an adaptive fit costs one function value per new node.
#include <array>
#include <cmath>
#include <cstddef>
#include <numbers>
#include <vector>

namespace tipgap::detail {

class chebyshev_interpolant {
public:
    // Node j of n (0..n) mapped to [a, b].
    static double node(double a, double b, int j, int n) {
        return 0.5 * (a + b) + 0.5 * (b - a) * std::cos(std::numbers::pi * j / n);
    }

    // values[j] = f(node(a, b, j, n)), n = values.size() - 1 >= 1.
    void fit(double a, double b, const std::vector<double>& values) {
        a_ = a;
        b_ = b;
        const int n = static_cast<int>(values.size()) - 1;
        c_.assign(n + 1, 0.0);
        // cos(pi j k / n) = cos(pi m / n) with m = j k mod 2n: one table of 2n cosines.
        thread_local std::vector<double> cos_table;
        thread_local int table_n = 0;
        if (table_n != n) {
            cos_table.resize(2 * n);
            for (int m = 0; m < 2 * n; ++m) cos_table[m] = std::cos(std::numbers::pi * m / n);
            table_n = n;
        }
        for (int k = 0; k <= n; ++k) {
            double sum = 0.5 * (values[0] + values[n] * cos_table[(n * k) % (2 * n)]);
            for (int j = 1; j < n; ++j) sum += values[j] * cos_table[(j * k) % (2 * n)];
            c_[k] = 2.0 * sum / n;
        }
        c_[0] *= 0.5;
        c_[n] *= 0.5;
    }

    double operator()(double x) const {
        double t = (2.0 * x - a_ - b_) / (b_ - a_);
        double b1 = 0.0, b2 = 0.0;
        for (int k = static_cast<int>(c_.size()) - 1; k >= 1; --k) {
            double b0 = 2.0 * t * b1 - b2 + c_[k];
            b2 = b1;
            b1 = b0;
        }
        return t * b1 - b2 + c_[0];
    }

    const std::vector<double>& coefficients() const { return c_; }

    // Several interpolants on the same interval with the same number of coefficients, evaluated
    // at one x with their Clenshaw recurrences interleaved: each recurrence is a chain of
    // dependent operations, so running them side by side costs little more than one. Each result
    // is bitwise operator()(x) of its interpolant. out[i] = (*fits[i])(x).
    template <std::size_t N>
    static void evaluate_together(const std::array<const chebyshev_interpolant*, N>& fits, double x,
                                  std::array<double, N>& out) {
        const chebyshev_interpolant& f0 = *fits[0];
        double t = (2.0 * x - f0.a_ - f0.b_) / (f0.b_ - f0.a_);
        std::array<double, N> b1{}, b2{};
        for (int k = static_cast<int>(f0.c_.size()) - 1; k >= 1; --k) {
            for (std::size_t i = 0; i < N; ++i) {
                double b0 = 2.0 * t * b1[i] - b2[i] + fits[i]->c_[k];
                b2[i] = b1[i];
                b1[i] = b0;
            }
        }
        for (std::size_t i = 0; i < N; ++i) out[i] = t * b1[i] - b2[i] + fits[i]->c_[0];
    }

private:
    double a_ = -1, b_ = 1;
    std::vector<double> c_;
};

}  // namespace tipgap::detail
