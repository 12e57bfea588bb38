// The paraboloid current: Gauss-Laguerre (the default path) against the adaptive reference
// integral, per total current, with the J passes each needs as a counter. And the uncertainty
// commands' library work on an example.yaml-like junction (paraboloid tip, 400 Monte Carlo draws):
// plan at 1 nA / 0.1 V and predict at 0.6 nm / 0.1 V, for the paraboloid and the contact-anchored
// geometry.
#include <benchmark/benchmark.h>

#include "tipgap/config/config.hpp"
#include "tipgap/model/current.hpp"
#include "tipgap/model/geometry.hpp"
#include "tipgap/plan/uncertainty.hpp"

namespace {

// configs/example.yaml's junction (Pt-Ir 5.5 +- 0.2 eV over Au, exact image, 4.2 K, paraboloid
// R = 10 +- 5 nm), written inline so the benchmark needs no file.
tipgap::config example(const char* kind) {
    std::string yaml = "tip: { material: platinum_iridium, work_function: 5.5 ± 0.2 eV, fermi_energy: 9.0 eV }\n"
                       "sample: { material: gold, work_function: 5.3 eV, fermi_energy: 5.5 eV }\n"
                       "barrier: { image_potential: exact, relative_permittivity: 1 }\n"
                       "temperature: 4.2 K\nmethod: wkb\ntolerance: 1e-6\n"
                       "geometry: { kind: ";
    yaml += kind;
    yaml += ", apex_radius: 10 ± 5 nm, contact_distance: 0.25 nm }\n";
    return tipgap::parse_config(yaml, "example-like.yaml");
}

void run(benchmark::State& state, bool laguerre) {
    const tipgap::model_options m = example("paraboloid").model;
    const double V = 0.1, R = 10e-9;
    double s = 0.5e-9, passes = 0, currents = 0, acc = 0;
    for (auto _ : state) {
        s = s < 1.5e-9 ? s + 1.3e-12 : 0.5e-9;
        if (laguerre) {
            auto sample = [&](double gap) {
                const auto d = tipgap::current_density_derivatives(m, gap, V, false);
                return tipgap::gap_sample{d.current_density_A_per_m2, d.d_ds_A_per_m3};
            };
            const auto r = tipgap::paraboloid_integral_laguerre(sample, R, s, m.rel_tol, sample(s));
            acc += r.value;
            passes += r.evaluations + 1;  // the apex
        } else {
            acc += tipgap::paraboloid_integral(
                [&](double gap) {
                    passes += 1;
                    return tipgap::current_density(m, gap, V);
                },
                R, s, m.rel_tol);
        }
        currents += 1;
    }
    benchmark::DoNotOptimize(acc);
    state.counters["J_passes_per_current"] = passes / currents;
}

void paraboloid_laguerre(benchmark::State& st) { run(st, true); }
void paraboloid_adaptive(benchmark::State& st) { run(st, false); }

void plan_example_400_draws(benchmark::State& state, const char* kind) {
    const tipgap::config c = example(kind);
    tipgap::uncertainty_options o;  // 400 draws, linear propagation too, seed 1
    o.threads = 1;
    for (auto _ : state) benchmark::DoNotOptimize(tipgap::plan_uncertainty(c, 1e-9, 0.1, {}, o).values[0].mc_stddev);
    state.SetLabel(kind);
}

void predict_example_400_draws(benchmark::State& state, const char* kind) {
    const tipgap::config c = example(kind);
    tipgap::uncertainty_options o;
    o.threads = 1;
    for (auto _ : state) benchmark::DoNotOptimize(tipgap::predict_uncertainty(c, 0.6e-9, 0.1, o).values[0].mc_stddev);
    state.SetLabel(kind);
}

}  // namespace

BENCHMARK(paraboloid_laguerre)->Unit(benchmark::kMicrosecond);
BENCHMARK(paraboloid_adaptive)->Unit(benchmark::kMicrosecond);
BENCHMARK_CAPTURE(plan_example_400_draws, paraboloid, "paraboloid")->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(plan_example_400_draws, contact_anchored, "contact_anchored")->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(predict_example_400_draws, paraboloid, "paraboloid")->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(predict_example_400_draws, contact_anchored, "contact_anchored")->Unit(benchmark::kMillisecond);
BENCHMARK_MAIN();
