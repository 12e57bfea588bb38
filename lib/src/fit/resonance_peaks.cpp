// Peaks of dz/dV (or dI/dV) in a bias trace: smoothing derivative, prominence, local refinement.
#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <random>

#include "fit/detail/local_polynomial.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/fit/resonances.hpp"

namespace tipgap {
namespace {

constexpr int kSmoothingDegree = 3;  // cubic: keeps a peak's height and position to O(w^4)
constexpr int kRefineDegree = 3;     // cubic: the inflection of z (peak of dz/dV) is linear in its coefficients
// A peak must rise 6 noise SDs of the smoothed derivative above its flanking minima: the rise is a
// difference of two correlated values, searched for over ~100 samples, and at 4 SD seeded white
// noise still made a spurious peak in one trace of three (tests/fit/resonances_test.cpp).
constexpr double kNoiseSigmas = 6.0;

void require(bool ok, const char* key, const std::string& why) {
    if (ok) return;
    location w;
    w.key = key;
    throw_input(w, why);
}

// Order of the smoothed derivative shown and searched: dz/dV for z(V), dI/dV itself otherwise.
int shown_order(trace_kind k) { return k == trace_kind::zv ? 1 : 0; }

struct smoothed_trace {
    std::vector<double> value, noise_gain;  // smoothed derivative; its SD per unit signal noise
    double noise_sd = 0;                    // signal noise SD from the local residuals
    std::vector<bool> full;                 // window entirely inside the trace
};

smoothed_trace smooth(trace_kind kind, const std::vector<double>& V, const std::vector<double>& y, double w) {
    smoothed_trace s;
    const std::size_t n = V.size();
    s.value.assign(n, 0.0);
    s.noise_gain.assign(n, 0.0);
    s.full.assign(n, false);
    const int k = shown_order(kind);
    double rss = 0.0;
    int dof = 0;
    for (std::size_t i = 0; i < n; ++i) {
        const auto p = detail::fit_local_polynomial(V, y, V[i], w, kSmoothingDegree);
        if (p.points == 0) continue;
        s.value[i] = p.derivative(k, V[i]);
        s.noise_gain[i] = (p.derivative_gradient(k, V[i]).transpose() * p.hat).norm();
        s.full[i] = V[i] - w >= V.front() && V[i] + w <= V.back();
        rss += p.rss;
        dof += p.points - (kSmoothingDegree + 1);
    }
    s.noise_sd = dof > 0 ? std::sqrt(rss / dof) : 0.0;
    return s;
}

// The deeper of the two minima between peak i and the nearest higher sample on each side.
double deeper_flank(const std::vector<double>& y, std::size_t i) {
    double left = y[i], right = y[i];
    for (std::size_t j = i; j-- > 0 && y[j] <= y[i];) left = std::min(left, y[j]);
    for (std::size_t j = i + 1; j < y.size() && y[j] <= y[i]; ++j) right = std::min(right, y[j]);
    return std::max(left, right);  // the higher of the two minima: the peak must clear both
}

// Position of the maximum of the shown derivative near V0 from a local cubic, with its standard
// error: the root x of F = P^(k+1)(x) = 0 and, by the delta method, var x = g' C g / F'(x)^2 with
// g = dF/dc and C = sigma^2 (A'A)^-1. sigma is the noise SD pooled over all smoothing windows: many
// degrees of freedom, so that +-1.96 se is a 95 % interval (a window's own 4 would need t = 2.8). On a
// noise-free trace it is the windows' own misfit.
// One local fit centred at c: the root x of P^(k)(x) = 0 with P^(k+1)(x) < 0 within the window.
bool local_peak(const detail::local_polynomial& p, int k, double c, double w, double& x) {
    x = c;
    for (int it = 0; it < 50; ++it) {
        const double f = p.derivative(k, x), df = p.derivative(k + 1, x);
        if (!(df < 0.0)) return false;  // not a maximum
        const double step = f / df;
        x -= step;
        if (std::abs(x - c) > w) return false;
        if (std::abs(step) < 1e-12 * w) break;
    }
    return true;
}

bool refine(trace_kind kind, const std::vector<double>& V, const std::vector<double>& y, double V0, double w,
            double sigma, double& x, double& se) {
    const int k = shown_order(kind) + 1;
    // Re-centre the window on the estimate: the grid sample the search started from is itself
    // shifted by the noise, and a window centred on it would add that shift to the estimate.
    // A pass that loses the peak (noise can flatten the re-centred window) keeps the previous one.
    double centre = V0;
    detail::local_polynomial p;
    bool found = false;
    for (int pass = 0; pass < 3; ++pass) {
        const auto q = detail::fit_local_polynomial(V, y, centre, w, kRefineDegree);
        double xq = 0.0;
        if (q.points == 0 || !local_peak(q, k, centre, w, xq) || std::abs(xq - V0) > w) break;
        p = q;
        x = centre = xq;
        found = true;
    }
    if (!found) return false;
    const Eigen::VectorXd g = p.derivative_gradient(k, x);
    const double dF = p.derivative(k + 1, x);
    se = sigma * std::sqrt(std::max(0.0, g.dot(p.inverse_normal * g))) / std::abs(dF);
    return true;
}

// Standard error of a peak position by a parametric bootstrap (Efron & Tibshirani 1993, An
// Introduction to the Bootstrap, ch. 6; from memory): the trace smoothed by local quintics (which
// keep the peak's curvature; the cubic windows of the search flatten it and made the bootstrap
// 1.4x too wide) plus white noise of the pooled SD,
// re-analysed kReplicates times with the same re-centred refinement. The delta method alone
// misses the noise in the cubic's curvature (a ratio estimator) and in the window's centre; on
// seeded Lorentzian traces it covered 81-91 % where 95 % was meant (tests/fit/resonances_test.cpp).
// The replicate seed is fixed, so the result is reproducible.
constexpr int kReplicates = 200;

constexpr int kBaseDegree = 5;

double bootstrap_stderr(trace_kind kind, const std::vector<double>& V, const std::vector<double>& data,
                        const smoothed_trace& s, double V0, double w, double fallback, std::size_t peak_index) {
    if (!(s.noise_sd > 0)) return fallback;
    std::vector<double> v, base;
    for (std::size_t j = 0; j < V.size(); ++j) {
        if (std::abs(V[j] - V0) > 2.0 * w) continue;
        const auto q = detail::fit_local_polynomial(V, data, V[j], w, kBaseDegree);
        v.push_back(V[j]);
        base.push_back(q.points > 0 ? q.derivative(0, V[j]) : data[j]);
    }
    std::mt19937_64 rng(0x7e50u + peak_index);
    std::normal_distribution<double> normal(0.0, 1.0);
    std::vector<double> y(base.size());
    double sum = 0, sum2 = 0;
    int n = 0;
    for (int r = 0; r < kReplicates; ++r) {
        for (std::size_t j = 0; j < y.size(); ++j) y[j] = base[j] + s.noise_sd * normal(rng);
        double x = 0, unused = 0;
        if (!refine(kind, v, y, V0, w, s.noise_sd, x, unused)) continue;
        sum += x;
        sum2 += x * x;
        ++n;
    }
    if (n < kReplicates / 2) return fallback;
    const double mean = sum / n;
    return std::sqrt(std::max(0.0, (sum2 - n * mean * mean) / (n - 1)));
}

}  // namespace

void resonance_options::validate() const {
    require(std::isfinite(smoothing_half_width_V) && smoothing_half_width_V > 0 && smoothing_half_width_V <= 2,
            "smoothing", fmt::format("{:g} V is out of range; expected a half width in (0, 2] V", smoothing_half_width_V));
    require(min_modulation >= 0 && min_modulation < 1, "min_modulation", "expected a fraction in [0, 1)");
    require(confidence_level >= 0.5 && confidence_level <= 0.9999, "confidence_level", "expected a level in [0.5, 0.9999]");
    require(max_model_traces >= 3 && max_model_traces <= 50, "max_model_traces", "expected 3 to 50 model traces");
    require(threads >= 0, "threads", "expected 0 (all cores) or a positive count");
}

const char* to_string(resonance_status s) {
    switch (s) {
        case resonance_status::ok: return "ok";
        case resonance_status::no_peaks: return "no_peaks";
        case resonance_status::formula_only: return "formula_only";
        case resonance_status::model_not_converged: return "model_not_converged";
    }
    return "?";
}

std::vector<resonance_peak> find_resonance_peaks(trace_kind kind, const std::vector<double>& V,
                                                 const std::vector<double>& y, const resonance_options& o,
                                                 std::vector<double>* smoothed_out) {
    const double w = o.smoothing_half_width_V;
    const smoothed_trace s = smooth(kind, V, y, w);
    if (smoothed_out) {
        // Within half a window of the ends the window is one-sided: shown as a gap, not searched.
        *smoothed_out = s.value;
        for (std::size_t i = 0; i < s.full.size(); ++i) {
            if (!s.full[i]) (*smoothed_out)[i] = std::numeric_limits<double>::quiet_NaN();
        }
    }
    std::vector<resonance_peak> peaks;
    const auto& d = s.value;
    for (std::size_t i = 1; i + 1 < d.size(); ++i) {
        if (!s.full[i] || !(d[i] > d[i - 1] && d[i] >= d[i + 1])) continue;
        const double floor = deeper_flank(d, i);
        const double rise = d[i] - floor;
        if (rise < o.min_modulation * std::abs(d[i]) || rise < kNoiseSigmas * s.noise_sd * s.noise_gain[i]) continue;
        resonance_peak p;
        double se = 0.0;
        if (!refine(kind, V, y, V[i], w, s.noise_sd, p.bias_V, se)) continue;
        p.bias_stderr_V = bootstrap_stderr(kind, V, y, s, V[i], w, se, peaks.size());
        p.height = d[i];
        p.modulation = floor > 0 ? d[i] / floor : std::numeric_limits<double>::infinity();
        p.order = static_cast<int>(peaks.size()) + 1;
        peaks.push_back(p);
    }
    return peaks;
}

}  // namespace tipgap
