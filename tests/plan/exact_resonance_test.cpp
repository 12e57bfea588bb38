// Field-emission resonances in a constant-current z(V) trace planned with `method: exact` (issue 12):
// standing waves between the barrier and the sample surface make dz/dV peak above the sample work
// function; the WKB trace rises smoothly.
#include <gtest/gtest.h>

#include <fmt/format.h>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/plan/plan.hpp"

using namespace tipgap;

namespace {

struct trace {
    std::vector<double> bias_V, dz_dV_nm_per_V;
};

// Built-in junction (W tip 4.5 eV, Au sample 5.3 eV, 4.2 K, planar 1 nm^2), 1 nA, 4.5..11.5 V.
trace dz_dV(method_kind m) {
    config c = default_config();
    c.model.method = m;
    c.model.bias_limit_V = 12.0;
    std::vector<std::pair<double, double>> setpoints;
    const int n = 141;  // 50 mV steps: a resonance in dz/dV is ~0.5 V wide
    for (int i = 0; i < n; ++i) setpoints.emplace_back(1e-9, 4.5 + 7.0 * i / (n - 1));
    const auto plan = plan_setpoints(c, setpoints, {}, 2);
    trace t;
    for (int i = 1; i + 1 < n; ++i) {
        EXPECT_TRUE(plan[i].reachable()) << setpoints[i].second;
        t.bias_V.push_back(setpoints[i].second);
        t.dz_dV_nm_per_V.push_back((plan[i + 1].solution.gap_m - plan[i - 1].solution.gap_m) * 1e9 /
                                   (setpoints[i + 1].second - setpoints[i - 1].second));
    }
    return t;
}

struct peak {
    double bias_V, height, modulation;  // modulation: height over the deeper neighbouring minimum
};

// Local maxima of dz/dV in (lo, hi), each with the ratio of its height to the lower of the two minima
// that flank it.
std::vector<peak> peaks(const trace& t, double lo, double hi) {
    std::vector<peak> out;
    const auto& y = t.dz_dV_nm_per_V;
    for (std::size_t i = 1; i + 1 < y.size(); ++i) {
        if (!(y[i] > y[i - 1] && y[i] >= y[i + 1]) || t.bias_V[i] <= lo || t.bias_V[i] >= hi) continue;
        double left = y[i], right = y[i];
        for (std::size_t j = i; j-- > 0 && y[j] <= left;) left = y[j];
        for (std::size_t j = i + 1; j < y.size() && y[j] <= right; ++j) right = y[j];
        out.push_back({t.bias_V[i], y[i], y[i] / std::min(left, right)});
    }
    return out;
}

}  // namespace

// An independent transfer-matrix calculation quoted in issue 12 puts the first three peaks near
// 6.30, 8.35 and 9.90 V with ±30-40 % modulation. The windows below are wide (±0.4 V: the surface
// model moves the peaks by ~0.1 V) and the modulation demanded is ±15 %: the test asks that the
// resonances exist and are where the physics puts them (first above the 5.3 eV work function, with
// spacings shrinking as n^(2/3) in a triangular well), not for one calculation's digits.
TEST(exact_resonance, plan_trace_shows_field_emission_peaks) {
    const auto p = peaks(dz_dV(method_kind::exact), 5.0, 11.0);
    ASSERT_GE(p.size(), 3u);
    const double centre[] = {6.30, 8.35, 9.90};
    for (int k = 0; k < 3; ++k) {
        EXPECT_NEAR(p[k].bias_V, centre[k], 0.4) << "peak " << k + 1;
        EXPECT_GT(p[k].modulation, 1.15 / 0.85) << "peak " << k + 1 << " at " << p[k].bias_V << " V";
    }
    EXPECT_GT(p[0].bias_V, 5.3);                                 // above the sample work function
    EXPECT_LT(p[2].bias_V - p[1].bias_V, p[1].bias_V - p[0].bias_V);  // spacings shrink
    for (std::size_t k = 0; k < p.size(); ++k) {
        RecordProperty("peak_" + std::to_string(k + 1), fmt::format("{:.2f} V, peak/trough {:.2f}", p[k].bias_V, p[k].modulation));
    }
}

TEST(exact_resonance, wkb_trace_has_no_peaks) {
    const trace t = dz_dV(method_kind::wkb);
    // WKB sets D = 1 above the barrier: dz/dV rises smoothly, without a single local maximum.
    EXPECT_TRUE(peaks(t, 5.0, 11.0).empty());
}
