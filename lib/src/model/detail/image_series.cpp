#include "model/detail/image_series.hpp"

#include <array>
#include <boost/math/special_functions/digamma.hpp>
#include <cmath>
#include <numbers>

namespace tipgap::detail {
namespace {

constexpr int kTerms = 26;  // h is analytic in an ellipse with rho = 3 + sqrt(8): 26 terms reach 1e-19
constexpr int kEven = kTerms / 2;  // h(a) = h(1 - a): only even T_k(t) appear; T_2k(t) = T_k(2t^2 - 1)

struct h_series {
    std::array<double, kTerms> c{};   // coefficients of h in T_k(t), t = 2a - 1
    std::array<double, kTerms> dc{};  // coefficients of dh/dt
    std::array<double, kEven> ce{};   // h = sum ce[k] T_k(2t^2 - 1)
    std::array<double, kEven> de{};   // (dh/dt)/t = sum de[k] T_k(2t^2 - 1) (dh/dt is odd)
    h_series() {
        // Chebyshev interpolation at the kTerms first-kind nodes (discrete cosine transform).
        std::array<double, kTerms> f{};
        for (int j = 0; j < kTerms; ++j) {
            double t = std::cos(std::numbers::pi * (j + 0.5) / kTerms);
            double a = 0.5 * (t + 1.0);
            f[j] = 2.0 * std::numbers::egamma + boost::math::digamma(1.0 + a) + boost::math::digamma(2.0 - a);
        }
        for (int k = 0; k < kTerms; ++k) {
            double sum = 0.0;
            for (int j = 0; j < kTerms; ++j) sum += f[j] * std::cos(std::numbers::pi * k * (j + 0.5) / kTerms);
            c[k] = 2.0 * sum / kTerms;
        }
        c[0] *= 0.5;
        // Derivative coefficients by the standard backward recurrence.
        dc[kTerms - 1] = 0.0;
        if (kTerms >= 2) dc[kTerms - 2] = 2.0 * (kTerms - 1) * c[kTerms - 1];
        for (int k = kTerms - 3; k >= 0; --k) dc[k] = dc[k + 2] + 2.0 * (k + 1) * c[k + 1];
        dc[0] *= 0.5;
        for (int k = 0; k < kEven; ++k) ce[k] = c[2 * k];
        // dh/dt = sum dc[2k+1] T_{2k+1}(t), and T_{2k+1}(t)/t in terms of T_j(2t^2-1):
        // T_{2k+1}(t) = t [T_k(u) + ... ] is messier; fit (dh/dt)/t directly instead.
        std::array<double, kEven> f2{};
        for (int j = 0; j < kEven; ++j) {
            double u = std::cos(std::numbers::pi * (j + 0.5) / kEven);  // u = 2t^2 - 1
            double t = std::sqrt(0.5 * (u + 1.0));
            double d = 0.0;
            for (int k = kTerms - 1; k >= 0; --k) d += dc[k] * std::cos(k * std::acos(t));
            f2[j] = d / t;
        }
        for (int k = 0; k < kEven; ++k) {
            double sum = 0.0;
            for (int j = 0; j < kEven; ++j) sum += f2[j] * std::cos(std::numbers::pi * k * (j + 0.5) / kEven);
            de[k] = 2.0 * sum / kEven;
        }
        de[0] *= 0.5;
    }
};

const h_series& series() {
    static const h_series s;
    return s;
}

template <std::size_t N>
double clenshaw(const std::array<double, N>& c, double t) {
    double b1 = 0.0, b2 = 0.0;
    for (int k = static_cast<int>(N) - 1; k >= 1; --k) {
        double b0 = 2.0 * t * b1 - b2 + c[k];
        b2 = b1;
        b1 = b0;
    }
    return t * b1 - b2 + c[0];
}

}  // namespace

double image_g_reference(double a) {
    return 2.0 * std::numbers::egamma + boost::math::digamma(a) + boost::math::digamma(1.0 - a);
}

double image_g(double a) {
    double t = 2.0 * a - 1.0;
    return clenshaw(series().ce, 2.0 * t * t - 1.0) - 1.0 / a - 1.0 / (1.0 - a);
}

double image_g_prime(double a) {
    double t = 2.0 * a - 1.0;
    double b = 1.0 - a;
    return 2.0 * t * clenshaw(series().de, 2.0 * t * t - 1.0) + 1.0 / (a * a) - 1.0 / (b * b);
}

}  // namespace tipgap::detail
