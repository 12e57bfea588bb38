// The noise model of the offset fit, σ² = σ_I² + (ε μ)²: white current noise plus noise
// proportional to the current (gap jitter δz gives δI ≈ 2κ μ δz, so ε = 2κ σ_z).
//
// Pseudo-residuals (Gasser, Sroka & Jennen-Steinmetz, Biometrika 73, 625 (1986), eq. 2): for three
// neighbours at z_{i-1} <= z_i <= z_{i+1},
//   ẽ_i = (a_i r_{i-1} + b_i r_{i+1} - r_i) / sqrt(a_i² + b_i² + 1),
//   a_i = (z_{i+1} - z_i)/(z_{i+1} - z_{i-1}),  b_i = (z_i - z_{i-1})/(z_{i+1} - z_{i-1}),
// which removes any locally linear trend, so E ẽ_i² = (a_i² v_{i-1} + b_i² v_{i+1} + v_i)/(a_i² +
// b_i² + 1) with v_j the variance at z_j. They are taken of the residuals of the current fit, so
// the curvature of the exponential itself does not enter. (σ_I², ε²) then maximise the normal
// likelihood of the ẽ_i with σ_I, ε >= 0 (Carroll & Ruppert, Transformation and Weighting in
// Regression, Chapman & Hall (1988), ch. 3, pseudo-likelihood estimation of a variance function),
// maximised over the ratio ε²/σ_I² with σ_I² profiled out in closed form.
#include <algorithm>
#include <boost/math/tools/minima.hpp>
#include <limits>
#include <cmath>
#include <vector>

#include "fit/detail/fit_internal.hpp"

namespace tipgap::detail {
namespace {

// The ratio ρ = ε²/σ_I² (in the scaled units) is searched on a logarithmic grid from 1e-4 to 1e8
// of 1/max B, i.e. from proportional noise far below the white noise everywhere to 1e4 times above
// it at the largest current, then refined by Brent's method between the grid neighbours of the best.
constexpr int grid_points = 61;
constexpr double ratio_low = 1e-4, ratio_high = 1e8;
constexpr int brent_bits = 40;

struct pseudo_residuals {
    std::vector<double> e2;  // ẽ_i², in units of the scale²
    std::vector<double> b;   // coefficient of ε² in E ẽ_i², in units of the scale²
};

pseudo_residuals make_pseudo_residuals(std::span<const double> z, std::span<const double> r,
                                       std::span<const double> mu, double scale) {
    pseudo_residuals out;
    for (std::size_t i = 1; i + 1 < z.size(); ++i) {
        const double span = z[i + 1] - z[i - 1];
        const double a = span > 0.0 ? (z[i + 1] - z[i]) / span : 0.5;
        const double b = span > 0.0 ? (z[i] - z[i - 1]) / span : 0.5;
        const double c2 = a * a + b * b + 1.0;
        const double e = (a * r[i - 1] + b * r[i + 1] - r[i]) / scale;
        const double m0 = mu[i - 1] / scale, m1 = mu[i] / scale, m2 = mu[i + 1] / scale;
        out.e2.push_back(e * e / c2);
        out.b.push_back((a * a * m0 * m0 + b * b * m2 * m2 + m1 * m1) / c2);
    }
    return out;
}

// -2 log-likelihood (up to a constant) of the pseudo-residuals for the variances s + t B_i.
double minus_two_log_likelihood(const pseudo_residuals& p, double s, double t) {
    double out = 0.0;
    for (std::size_t i = 0; i < p.e2.size(); ++i) {
        const double v = s + t * p.b[i];
        out += std::log(v) + p.e2[i] / v;
    }
    return out;
}

// (s, t) at ratio ρ = t/s: the likelihood's s for that ratio is mean(ẽ²/(1 + ρB)) (profile
// likelihood); s_fixed holds s.
void at_ratio(const pseudo_residuals& p, double rho, double s_min, bool s_fixed, double& s, double& t) {
    if (s_fixed) {
        s = s_min;
    } else {
        double sum = 0.0;
        for (std::size_t i = 0; i < p.e2.size(); ++i) sum += p.e2[i] / (1.0 + rho * p.b[i]);
        s = std::max(sum / static_cast<double>(p.e2.size()), s_min);
    }
    t = rho * s;
}

}  // namespace

noise_model estimate_noise_model(std::span<const double> z_m, std::span<const double> residual_A,
                                 std::span<const double> mean_A, double fixed_current_noise_A,
                                 double min_current_noise_A) {
    noise_model out;
    const bool s_fixed = fixed_current_noise_A > 0.0;
    double sum2 = 0.0;
    for (double r : residual_A) sum2 += r * r;
    const double scale = std::sqrt(sum2 / static_cast<double>(std::max<std::size_t>(residual_A.size(), 1)));
    if (!(scale > 0.0) || z_m.size() < 3) {
        out.current_noise_A = s_fixed ? fixed_current_noise_A : min_current_noise_A;
        return out;
    }
    const pseudo_residuals p = make_pseudo_residuals(z_m, residual_A, mean_A, scale);
    const double s_min = std::pow((s_fixed ? fixed_current_noise_A : min_current_noise_A) / scale, 2);
    double b_max = 0.0;
    for (double b : p.b) b_max = std::max(b_max, b);
    double s = 0.0, t = 0.0;
    auto objective = [&](double log_rho) {
        double s_, t_;
        at_ratio(p, std::exp(log_rho), s_min, s_fixed, s_, t_);
        return minus_two_log_likelihood(p, s_, t_);
    };
    at_ratio(p, 0.0, s_min, s_fixed, s, t);
    double best = minus_two_log_likelihood(p, s, t), best_x = -std::numeric_limits<double>::infinity();
    if (b_max > 0.0) {
        const double lo = std::log(ratio_low / b_max), hi = std::log(ratio_high / b_max);
        const double step = (hi - lo) / (grid_points - 1);
        for (int k = 0; k < grid_points; ++k) {
            const double x = lo + step * k, v = objective(x);
            if (v < best) best = v, best_x = x;
        }
        if (std::isfinite(best_x)) {
            const auto m = boost::math::tools::brent_find_minima(objective, best_x - step, best_x + step, brent_bits);
            best_x = m.second < best ? m.first : best_x;
            at_ratio(p, std::exp(best_x), s_min, s_fixed, s, t);
        }
    }
    out.current_noise_A = std::sqrt(s) * scale;
    out.relative_noise = std::sqrt(t);
    return out;
}

}  // namespace tipgap::detail
