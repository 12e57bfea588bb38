// Guard rails of the model: every point inside the documented domain gives finite numbers, and the
// edges of the domain are rejected with the reason.
//
// Domain (the model core's documented validity): gap s in [0.2, 5] nm, |V| <= 10 V (the default
// bias_limit), work functions in [1, 8] eV, T in [0, 1000] K, every image-potential kind and both
// methods. The points are a Halton sequence (bases 2, 3, 5, 7, 11) in that box plus its corners, so
// the sweep is the same on every platform and covers the box evenly.
#include <gtest/gtest.h>

#include <array>
#include <cmath>
#include <mutex>
#include <string>
#include <vector>

#include "core/detail/parallel.hpp"
#include "tipgap/config/config.hpp"
#include "tipgap/model/current.hpp"
#include "tipgap/plan/predict.hpp"
#include "tipgap/core/units.hpp"

using namespace tipgap;
using tipgap::detail::parallel_for;

namespace {

// Points per (image kind, method) combination: 6 combinations x 1700 = 10,200 interior points
// (plus 6 x 64 corners), the "at least 10,000".
constexpr int kPointsPerCombination = 1700;

// Tolerance of the model for the sweep. Finiteness does not depend on accuracy, and 1e-4 keeps
// the sweep (7 current evaluations per point) within a few seconds in a Release build.
constexpr double kSweepTolerance = 1e-4;

// The box.
constexpr double kGapMin = 0.2e-9, kGapMax = 5e-9;  // m
constexpr double kBiasMax = 10.0;                  // V
constexpr double kPhiMin = 1.0, kPhiMax = 8.0;     // eV
constexpr double kTMax = 1000.0;                   // K

// Radical inverse of i in base b (the Halton coordinate), in [0, 1).
double halton(int i, int base) {
    double f = 1.0, r = 0.0;
    for (int n = i; n > 0; n /= base) {
        f /= base;
        r += f * (n % base);
    }
    return r;
}

struct sample_point {
    double gap_m, bias_V, phi_tip_eV, phi_sample_eV, temperature_K;
};

std::vector<sample_point> domain_points() {
    std::vector<sample_point> pts;
    // Corners: both ends of every coordinate, bias also at 0 and +-1 mV (the linear-response
    // branch of evaluate_point).
    const double biases[] = {-kBiasMax, -1e-3, 0.0, kBiasMax};
    for (double s : {kGapMin, kGapMax})
        for (double V : biases)
            for (double pt : {kPhiMin, kPhiMax})
                for (double ps : {kPhiMin, kPhiMax})
                    for (double T : {0.0, kTMax}) pts.push_back({s, V, pt, ps, T});
    for (int i = 1; i <= kPointsPerCombination; ++i) {
        pts.push_back({kGapMin + (kGapMax - kGapMin) * halton(i, 2), kBiasMax * (2.0 * halton(i, 3) - 1.0),
                       kPhiMin + (kPhiMax - kPhiMin) * halton(i, 5), kPhiMin + (kPhiMax - kPhiMin) * halton(i, 7),
                       kTMax * halton(i, 11)});
    }
    return pts;
}

std::string describe(const model_options& o, const sample_point& p) {
    return "s = " + std::to_string(p.gap_m * 1e9) + " nm, V = " + std::to_string(p.bias_V) +
           " V, phi_tip = " + std::to_string(p.phi_tip_eV) + " eV, phi_sample = " + std::to_string(p.phi_sample_eV) +
           " eV, T = " + std::to_string(p.temperature_K) + " K, image " + to_string(o.image) + ", method " +
           to_string(o.method);
}

}  // namespace

TEST(domain_sweep, every_output_is_finite_inside_the_domain) {
    const std::vector<sample_point> pts = domain_points();
    std::size_t evaluated = 0;
    for (image_kind image : {image_kind::none, image_kind::exact, image_kind::approximate}) {
        for (method_kind method : {method_kind::wkb, method_kind::simmons}) {
            std::mutex m;
            std::vector<std::string> failures;
            std::vector<std::string> sign_failures;
            parallel_for(pts.size(), 0, [&](std::size_t i) {
                const sample_point& p = pts[i];
                model_options o;
                o.image = image;
                o.method = method;
                o.rel_tol = kSweepTolerance;
                o.temperature_K = p.temperature_K;
                o.tip.work_function_J = p.phi_tip_eV * eV;
                o.sample.work_function_J = p.phi_sample_eV * eV;
                o.validate();
                validate_operating_point(o, p.gap_m, p.bias_V, "gap", "bias");
                point_quantities q = evaluate_point(o, p.gap_m, p.bias_V);
                const std::array<std::pair<const char*, double>, 7> values{{
                    {"J", q.current_density_A_per_m2},
                    {"J/V", q.conductance_density_S_per_m2},
                    {"dJ/dV", q.differential_conductance_density_S_per_m2},
                    {"kappa", q.decay_constant_per_m},
                    {"phi_ap", q.apparent_barrier_J},
                    {"barrier top", q.barrier_top_J},
                    {"barrier width", q.barrier_width_m},
                }};
                std::string bad;
                for (const auto& [name, v] : values) {
                    if (!std::isfinite(v)) bad += std::string(" ") + name + " = " + std::to_string(v);
                }
                // The current flows with the bias (Tsu-Esaki: the supply function has the sign of V).
                const double J = q.current_density_A_per_m2;
                if ((p.bias_V != 0.0 && !(J * p.bias_V > 0.0)) || (p.bias_V == 0.0 && J != 0.0)) {
                    std::lock_guard<std::mutex> lock(m);
                    sign_failures.push_back(describe(o, p) + ": J = " + std::to_string(J));
                }
                if (!bad.empty()) {
                    std::lock_guard<std::mutex> lock(m);
                    failures.push_back(describe(o, p) + ":" + bad);
                }
            });
            evaluated += pts.size();
            EXPECT_TRUE(failures.empty()) << failures.size() << " points with non-finite output, first: "
                                          << (failures.empty() ? "" : failures.front());
            EXPECT_TRUE(sign_failures.empty()) << sign_failures.size() << " points with J against the bias, first: "
                                               << (sign_failures.empty() ? "" : sign_failures.front());
        }
    }
    EXPECT_GE(evaluated, 10000u);
}

// The edges of the domain are refused with the reason, naming the key.
namespace {
std::string message_of_config(const std::string& yaml) {
    try {
        parse_config(yaml, "g.yaml");
    } catch (const error& e) {
        EXPECT_EQ(e.kind(), error_kind::input);
        return e.what();
    }
    return "(accepted)";
}
}  // namespace

TEST(domain_guard_rails, config_values_outside_the_model_are_rejected) {
    const std::string base = "tip: {material: tungsten}\nsample: {material: gold}\n";
    EXPECT_EQ(message_of_config("tip: {work_function: 0 eV}\nsample: {material: gold}\n"),
              "g.yaml:1:22: tip.work_function: 0 eV is out of range; expected a work function in (0, 20] eV");
    EXPECT_EQ(message_of_config("tip: {material: tungsten}\nsample: {work_function: -1 eV}\n"),
              "g.yaml:2:25: sample.work_function: -1 eV is out of range; expected a work function in (0, 20] eV");
    EXPECT_EQ(message_of_config(base + "temperature: -1 K\n"),
              "g.yaml:3:14: temperature: -1 K is out of range; expected a temperature in [0, 2000] K");
    EXPECT_EQ(message_of_config(base + "barrier: {relative_permittivity: 0.5}\n"),
              "g.yaml:3:34: barrier.relative_permittivity: 0.5 is out of range; expected a relative permittivity in "
              "[1, 1000] (1 for vacuum)");
    EXPECT_EQ(message_of_config(base + "bias_limit: 0 V\n"),
              "g.yaml:3:13: bias_limit: 0 V is out of range; expected a bias limit in (0, 100] V");
    EXPECT_EQ(message_of_config(base + "geometry: {kind: planar, area: 1e300 m^2}\n"),
              "g.yaml:3:32: geometry.area: 1e+300 m^2 is out of range; expected an area in (0, 1e-6 m^2]");
    // Inside the domain the same keys are accepted.
    EXPECT_EQ(message_of_config(base + "temperature: 0 K\nbarrier: {relative_permittivity: 1}\nbias_limit: 100 V\n"),
              "(accepted)");
}

TEST(domain_guard_rails, operating_points_outside_the_model_are_rejected) {
    model_options o;
    o.bias_limit_V = 5.0;
    auto message = [&](double s, double V) -> std::string {
        try {
            validate_operating_point(o, s, V, "--gap", "--bias");
        } catch (const error& e) {
            EXPECT_EQ(e.kind(), error_kind::input);
            return e.what();
        }
        return "(accepted)";
    };
    EXPECT_EQ(message(0.0, 0.1), "--gap: gap 0 nm is not positive; expected a gap in (0, 100] nm");
    EXPECT_EQ(message(-0.5e-9, 0.1), "--gap: gap -0.5 nm is not positive; expected a gap in (0, 100] nm");
    EXPECT_EQ(message(std::nan(""), 0.1), "--gap: gap nan nm is not positive; expected a gap in (0, 100] nm");
    EXPECT_EQ(message(0.6e-9, 5.5),
              "--bias: |bias| 5.5 V exceeds the configured bias_limit; expected |bias| <= 5 V (raise bias_limit in "
              "the configuration to go further)");
    EXPECT_EQ(message(0.6e-9, -5.5),
              "--bias: |bias| 5.5 V exceeds the configured bias_limit; expected |bias| <= 5 V (raise bias_limit in "
              "the configuration to go further)");
    EXPECT_EQ(message(0.6e-9, 5.0), "(accepted)");
    EXPECT_EQ(message(0.6e-9, -5.0), "(accepted)");
}
