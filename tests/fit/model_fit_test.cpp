// The model comparison fit: recovery of a known work function and gap offset from a noise-free
// model curve, and its need for the bias.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <string>

#include "support/synth_sweep.hpp"
#include "support/reference_junction.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/fit/model_fit.hpp"
#include "tipgap/synth/synth.hpp"

using namespace tipgap;
using tipgap_test::as_sweep;

namespace {
constexpr double nm_ = 1e-9;
constexpr double eV_ = si::electron_volt;
}  // namespace


// Model comparison on a noise-free curve made by the model itself, with a mean work function
// (4.6 eV) and a gap offset (0.55 nm at z = 0) different from the fit's start (the default
// config's 4.9 eV and a current-matched offset): the fit recovers both. The residuals are
// limited by the model's own accuracy (rel_tol 1e-6 in J) and the cubic B-spline interpolation
// over 33 gaps (~1e-6 in ln|I|); with the strong φ̄-s0 correlation (~-0.996) that leaves errors of
// a few 1e-6 eV and 1e-6 nm (measured: 4.599999 eV, 0.550001 nm). Tolerances 0.1 meV and
// 0.1 pm: 100x the measured error (room for other compilers and maths libraries), still 1000x
// below the 0.2 eV differences a user compares.
TEST(model_fit, recovers_work_function_and_gap_offset_from_noise_free_model_curve) {
    config c = tipgap_test::reference_junction();
    config truth = with_mean_work_function(c, 4.6 * eV_);
    synth_options o;
    o.gap_min_m = 0.5 * nm_;
    o.gap_max_m = 1.1 * nm_;
    o.gap_at_z0_m = 0.55 * nm_;  // z starts at -0.05 nm
    o.points = 61;
    const synth_curve s = synthesise_curve(truth, o);
    const curve_sweep sweep = as_sweep(s, 0, s.samples.size());
    const fit_result lin = fit_sweep(sweep, o.bias_V, fit_options{.model = fit_model::linear});
    const model_fit_result m = fit_model_to_sweep(c, sweep, lin, o.bias_V);
    std::printf("model fit: W %.6f eV (true 4.6), offset %.6f nm (true 0.55), a %.2e, %d iterations, %d evaluations\n",
                m.mean_work_function_J / eV_, m.gap_offset_m / nm_, m.ln_prefactor, m.iterations, m.model_evaluations);
    constexpr double kWorkFunction = 1e-4 * eV_;
    constexpr double kOffset = 1e-13;
    EXPECT_EQ(m.status, fit_status::converged);
    EXPECT_NEAR(m.mean_work_function_J, 4.6 * eV_, kWorkFunction);
    EXPECT_NEAR(m.gap_offset_m, 0.55 * nm_, kOffset);
    EXPECT_NEAR(m.ln_prefactor, 0.0, 0.01);  // same area as the truth
    // The difference tip - sample is held: 4.5 - 5.3 eV.
    EXPECT_NEAR(m.tip_work_function_J - m.sample_work_function_J, -0.8 * eV_, 1e-12 * eV_);
    // The image potential puts φ_ap well below the mean work function (0.3-0.7 eV here).
    EXPECT_LT(m.data_apparent_barrier_J, m.mean_work_function_J - 0.2 * eV_);
    EXPECT_NEAR(m.model_apparent_barrier_J, m.data_apparent_barrier_J, 1e-3 * eV_);
    EXPECT_LT(m.model_evaluations, 10000);
}

TEST(model_fit, needs_a_bias) {
    const config c = tipgap_test::reference_junction();
    synth_options o;
    const synth_curve s = synthesise_curve(c, o);
    const curve_sweep sweep = as_sweep(s, 0, s.samples.size());
    const fit_result lin = fit_sweep(sweep, o.bias_V, fit_options{.model = fit_model::linear});
    try {
        fit_model_to_sweep(c, sweep, lin, std::nan(""), {}, location{"x.csv", 0, 0, ""});
        FAIL() << "no exception";
    } catch (const error& e) {
        EXPECT_EQ(std::string(e.what()),
                  "x.csv: the model comparison needs the bias: add '# bias: 100 mV' (for example) to the curve file");
    }
}
