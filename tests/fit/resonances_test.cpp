// Resonance peaks of bias traces and the work function from them (tipgap/fit/resonances.hpp).
#include <gtest/gtest.h>

#include <cmath>
#include <fmt/format.h>
#include <numbers>
#include <random>

#include "tipgap/config/config.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/fit/resonances.hpp"
#include "tipgap/model/geometry.hpp"
#include "tipgap/plan/plan.hpp"

using namespace tipgap;

namespace {

constexpr double J_per_eV = si::electron_volt;

// Independent generator (not tipgap's model): z(V) = b V + sum_k A_k w_k atan((V - V_k)/w_k), whose
// dz/dV = b + sum_k A_k / (1 + ((V - V_k)/w_k)^2) has Lorentzian peaks on a constant background.
struct lorentz_trace {
    double b = 2e-10;                             // m/V
    std::vector<double> centre{6.0, 8.0, 9.6};   // V
    double amplitude = 1e-10, width = 0.25;      // m/V, V
    double z(double V) const {
        double s = b * V;
        for (double c : centre) s += amplitude * width * std::atan((V - c) / width);
        return s;
    }
    double dz(double V) const {
        double s = b;
        for (double c : centre) s += amplitude / (1.0 + std::pow((V - c) / width, 2));
        return s;
    }
    // True maximum of dz/dV near c (golden-section search on the analytic derivative).
    double maximum_near(double c) const {
        double lo = c - 0.2, hi = c + 0.2;
        const double g = (std::sqrt(5.0) - 1.0) / 2.0;
        for (int i = 0; i < 100; ++i) {
            const double a = hi - g * (hi - lo), d = lo + g * (hi - lo);
            (dz(a) > dz(d) ? hi : lo) = dz(a) > dz(d) ? d : a;
        }
        return 0.5 * (lo + hi);
    }
};

bias_trace sample(const lorentz_trace& L, double noise_m, std::uint64_t seed) {
    bias_trace t;
    t.kind = trace_kind::zv;
    std::mt19937_64 rng(seed);
    std::normal_distribution<double> n(0.0, 1.0);
    for (int i = 0; i <= 130; ++i) {
        const double V = 4.0 + 0.05 * i;
        t.bias_V.push_back(V);
        t.signal.push_back(L.z(V) + noise_m * n(rng));
    }
    return t;
}

// The built-in junction with method exact, biases up to 12 V and the sample work function phi_eV:
// the "truth" of the self-consistency traces below.
config exact_truth(double phi_eV) {
    config c = default_config();
    c.model.method = method_kind::exact;
    c.model.bias_limit_V = 12;
    c.model.sample.work_function_J = phi_eV * J_per_eV;
    return c;
}

}  // namespace

// On a noise-free 50 mV grid the cubic refinement puts each peak within 6 mV of the analytic
// maximum (a Lorentzian of 0.25 V half width under a +-0.3 V cubic: measured 4.5 mV, the cubic's own
// error; the model fit applies the same operator to its model traces, so there it cancels).
constexpr double kNoiseFreeTol_V = 6e-3;

TEST(resonance_peaks, finds_lorentzian_peaks_of_dz_dv) {
    const lorentz_trace L;
    const bias_trace t = sample(L, 0.0, 1);
    std::vector<double> smoothed;
    const auto p = find_resonance_peaks(t.kind, t.bias_V, t.signal, {}, &smoothed);
    ASSERT_EQ(p.size(), 3u);
    for (int k = 0; k < 3; ++k) {
        EXPECT_EQ(p[k].order, k + 1);
        EXPECT_NEAR(p[k].bias_V, L.maximum_near(L.centre[k]), kNoiseFreeTol_V) << k;
        EXPECT_GT(p[k].modulation, 1.3);
    }
    // The smoothing derivative follows dz/dV: a cubic over +-0.3 V flattens the 0.25 V Lorentzians by
    // at most 6 % of their amplitude (measured 4.6 %).
    for (std::size_t i = 10; i + 10 < t.bias_V.size(); ++i) EXPECT_NEAR(smoothed[i], L.dz(t.bias_V[i]), 0.06 * L.amplitude);
}

// Coverage of the peak standard errors: over 400 seeded noisy traces (2 pm white z noise on a 50 mV
// grid, peaks 30 pm/0.1 V high), the first peak's +-1.96 se interval holds the true maximum in 95 %
// of them; binomial SD sqrt(0.95 0.05/400) = 0.011, so 0.95 +- 0.035 (3.2 SD). Spurious peaks are
// rejected: exactly 3 peaks in >= 97 % of the traces.
TEST(resonance_peaks, standard_error_covers_true_position) {
    const lorentz_trace L;
    const double truth = L.maximum_near(L.centre[0]);
    int covered = 0, three = 0;
    const int n = 400;
    for (int seed = 1; seed <= n; ++seed) {
        const bias_trace t = sample(L, 2e-12, static_cast<std::uint64_t>(seed));
        const auto p = find_resonance_peaks(t.kind, t.bias_V, t.signal, {});
        if (p.size() == 3) ++three;
        if (!p.empty() && std::abs(p[0].bias_V - truth) <= 1.96 * p[0].bias_stderr_V) ++covered;
    }
    const double coverage = static_cast<double>(covered) / n;
    RecordProperty("coverage", fmt::format("{:.3f}", coverage));
    EXPECT_NEAR(coverage, 0.95, 0.035);
    EXPECT_GE(three, static_cast<int>(0.97 * n));
}

TEST(resonance_peaks, smooth_trace_has_none) {
    bias_trace t;
    t.kind = trace_kind::zv;
    for (int i = 0; i <= 100; ++i) {
        const double V = 4.0 + 0.06 * i;
        t.bias_V.push_back(V);
        t.signal.push_back(1e-10 * V + 4e-12 * V * V);
    }
    config c = default_config();
    t.current_A = 1e-9;
    const auto r = analyse_resonances(c, t, {});
    EXPECT_EQ(r.status, resonance_status::no_peaks);
    EXPECT_TRUE(r.peaks.empty());
    EXPECT_EQ(r.message, "no resonance found with a 0.6 V smoothing window; the trace may end below the sample "
                         "work function, or the peaks are weaker than the noise");
}

// The triangular-well formula inverted on its own series: peaks at e V_n = phi + C (F n)^(2/3),
// C = (3 pi hbar e/(2 sqrt(2m)))^(2/3) (written out here from CODATA 2018), z(V) a line of slope 1/F.
TEST(resonance_formula, inverts_its_own_series_from_slope_and_from_series) {
    const double F = 5e9, phi = 4.6 * J_per_eV;
    const double C = std::pow(3.0 * std::numbers::pi * 1.054571817e-34 * 1.602176634e-19 /
                                  (2.0 * std::sqrt(2.0 * 9.1093837015e-31)), 2.0 / 3.0);
    for (trace_kind kind : {trace_kind::zv, trace_kind::didv}) {
        bias_trace t;
        t.kind = kind;
        for (int i = 0; i <= 120; ++i) {
            t.bias_V.push_back(4.0 + 0.05 * i);
            t.signal.push_back(t.bias_V.back() / F);
        }
        resonance_result r;
        r.smoothing_width_V = 0.4;
        for (int n = 1; n <= 3; ++n) {
            resonance_peak p;
            p.order = n;
            p.bias_V = (phi + C * std::pow(F * n, 2.0 / 3.0)) / 1.602176634e-19;
            r.peaks.push_back(p);
        }
        triangular_well_estimate(t, r);
        EXPECT_NEAR(r.work_function_formula_J / phi, 1.0, 1e-9) << to_string(kind);
        EXPECT_NEAR(r.field_V_per_m / F, 1.0, 1e-9) << to_string(kind);
    }
}

// The model fit on a noise-free trace of tipgap's own exact model (sample work function 4.8 eV,
// configured 5.3 eV): the fit must move to 4.8 eV and reproduce the peaks (self-consistency; the
// recovery from an independent generator is tests/cli/resonances_cli.sh).
TEST(resonance_model, recovers_work_function_of_own_model_trace) {
    const config truth = exact_truth(4.8);
    bias_trace t;
    t.kind = trace_kind::zv;
    t.current_A = 1e-9;
    std::vector<std::pair<double, double>> sp;
    for (int i = 0; i <= 60; ++i) {
        t.bias_V.push_back(4.5 + 0.075 * i);
        sp.emplace_back(1e-9, t.bias_V.back());
    }
    for (const auto& p : plan_setpoints(truth, sp, {}, 2)) t.signal.push_back(p.solution.gap_m + 2e-9);
    resonance_options o;
    o.threads = 2;
    const auto r = analyse_resonances(default_config(), t, o);
    ASSERT_EQ(r.status, resonance_status::ok) << r.message;
    ASSERT_GE(r.peaks.size(), 2u);
    EXPECT_NEAR(r.work_function_J / J_per_eV, 4.8, 5e-3);
    EXPECT_LE(r.work_function_ci_low_J, 4.8 * J_per_eV + 5e-3 * J_per_eV);
    EXPECT_GE(r.work_function_ci_high_J, 4.8 * J_per_eV - 5e-3 * J_per_eV);
    for (std::size_t k = 0; k < r.peaks.size(); ++k) EXPECT_NEAR(r.model_peaks_V[k], r.peaks[k].bias_V, 5e-3);
    EXPECT_LE(r.model_traces, o.max_model_traces);
    RecordProperty("work_function_eV", fmt::format("{:.4f} in {} traces", r.work_function_J / J_per_eV, r.model_traces));
}

TEST(resonance_model, needs_the_setpoint_current) {
    const lorentz_trace L;
    bias_trace t = sample(L, 0.0, 1);
    t.file = "trace.csv";
    try {
        analyse_resonances(default_config(), t, {});
        FAIL() << "no throw";
    } catch (const error& e) {
        EXPECT_STREQ(e.what(), "trace.csv: current: the trace has no '# current:' line; the model fit needs the "
                               "setpoint current (e.g. '# current: 1 nA')");
    }
}

// A dI/dV trace with the feedback on (tipgap's own exact model, sample 5.0 eV, lock-in in arbitrary
// units: the model is scaled onto it): the same resonances, found as peaks of dI/dV itself, and the
// model fit recovers the work function (self-consistency of the dI/dV path).
TEST(resonance_model, recovers_work_function_from_didv_trace) {
    const config truth = exact_truth(5.0);
    bias_trace t;
    t.kind = trace_kind::didv;
    t.arbitrary_units = true;
    t.current_A = 1e-9;
    for (int i = 0; i <= 45; ++i) t.bias_V.push_back(4.5 + 0.1 * i);  // 0.1 V: 7 samples per window
    t.signal.resize(t.bias_V.size());
    for (std::size_t i = 0; i < t.bias_V.size(); ++i) {
        const double V = t.bias_V[i], s = solve_gap(truth, 1e-9, V).gap_m, h = 1e-3;
        t.signal[i] = 3e9 * (total_current(truth.model, truth.geometry, s, V + h) -
                             total_current(truth.model, truth.geometry, s, V - h)) / (2.0 * h);
    }
    resonance_options o;
    o.threads = 2;
    const auto r = analyse_resonances(default_config(), t, o);
    ASSERT_EQ(r.status, resonance_status::ok) << r.message;
    ASSERT_GE(r.peaks.size(), 2u);
    EXPECT_NEAR(r.work_function_J / J_per_eV, 5.0, 1e-2);
    // The formula's dI/dV branch fits phi and F to V_n against n^(2/3): a field of a few V/nm.
    EXPECT_GT(r.field_V_per_m, 1e9);
    EXPECT_LT(r.field_V_per_m, 2e10);
}
