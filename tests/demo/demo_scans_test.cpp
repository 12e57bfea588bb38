// The shipped demo curves (demo_scans/, made by tipgap synth): fit recovers their ground truth.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <vector>

#include <unistd.h>

#include "tipgap/core/error.hpp"
#include "tipgap/demo/demo.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/synth/synth.hpp"

using namespace tipgap;
namespace fs = std::filesystem;

// Ground-truth recovery on the shipped demo curves. The synthesiser's expected κ is the
// noise-free curve's I²-weighted straight line of ln|I| over the usable points (synth.hpp), which
// is the linear model's estimand: its 95 % interval must hold it on every sweep (eight sweeps at
// 95 %; the seeds are fixed, and demo_scans/make_demo_scans.sh regenerates the same files).
// The curves come from the WKB model with the image potential, so ln|I| is not a straight line
// and κ depends on how the points are weighted: the default offset model (weights from its noise
// model) must then say so, with χ²/dof well above 1, a curvature warning, and an estimate within
// 1 % of the linear estimand (the spread of the local κ over these gaps, from the truth files'
// model range, is ~1-2 %).
TEST(demo_scans, fit_recovers_truth_within_stated_uncertainty) {
    const fs::path dir = fs::path(TIPGAP_SOURCE_DIR) / "demo_scans";
    std::size_t sweeps = 0;
    for (const fs::directory_entry& e : fs::directory_iterator(dir)) {
        if (e.path().extension() != ".csv") continue;
        fs::path fit_file = e.path();
        if (fs::exists(fit_file.replace_extension(".fit.yaml"))) continue;  // fitted otherwise: next test
        const measured_curve m = read_curve_csv(e.path().string());
        const truth_record t = read_truth(truth_path_for(e.path().string()));
        const std::vector<fit_result> fits = fit_curve(m, fit_options{.model = fit_model::linear});
        const std::vector<fit_result> honest = fit_curve(m, fit_options{});
        ASSERT_EQ(fits.size(), t.sweeps.size()) << e.path();
        for (std::size_t k = 0; k < fits.size(); ++k) {
            ++sweeps;
            const double truth = t.sweeps[k].decay_constant_expected_per_m;
            EXPECT_EQ(fits[k].direction, t.sweeps[k].direction);
            EXPECT_GE(truth, fits[k].decay_constant_ci_low_per_m) << e.path() << " sweep " << k;
            EXPECT_LE(truth, fits[k].decay_constant_ci_high_per_m) << e.path() << " sweep " << k;
            EXPECT_NEAR(honest[k].decay_constant_per_m, truth, 0.01 * truth) << e.path() << " sweep " << k;
            if (honest[k].reduced_chi_square > 10.0) {
                EXPECT_LT(honest[k].curvature_p_value, 1e-3) << e.path();
            }
            std::printf("%s %s: kappa %.4f +- %.4f (default: %.4f +- %.4f, chi2/dof %.3g), truth %.4f /nm\n",
                        e.path().filename().c_str(), to_string(fits[k].direction), fits[k].decay_constant_per_m * 1e-9,
                        fits[k].decay_constant_stderr_per_m * 1e-9, honest[k].decay_constant_per_m * 1e-9,
                        honest[k].decay_constant_stderr_per_m * 1e-9, honest[k].reduced_chi_square, truth * 1e-9);
        }
    }
    EXPECT_GE(sweeps, 8u);
}

// 09_w_au111_offset.csv: +3 pA amplifier offset at 1 pA noise, a retract curve from 100 pA far into
// the tail (demo_scans/make_demo_scans.sh). The default offset model must recover the offset and
// the model's own κ (drift-free, without the baseline) inside its 95 % intervals, while a straight
// line through ln|I| reads κ several percent low (the offset flattens the tail). Its
// 09_w_au111_offset.fit.yaml makes `tipgap demo` fit it with the offset model.
TEST(demo_scans, offset_curve_recovers_offset_and_kappa) {
    const fs::path file = fs::path(TIPGAP_SOURCE_DIR) / "demo_scans" / "09_w_au111_offset.csv";
    ASSERT_TRUE(fs::exists(fs::path(TIPGAP_SOURCE_DIR) / "demo_scans" / "09_w_au111_offset.fit.yaml"));
    const measured_curve m = read_curve_csv(file.string());
    const truth_record t = read_truth(truth_path_for(file.string()));
    ASSERT_NEAR(t.baseline_A, 3e-12, 1e-18);
    ASSERT_EQ(t.sweeps.size(), 1u);
    const double truth = t.sweeps[0].decay_constant_model_per_m;
    const fit_result f = fit_curve(m, fit_options{}).at(0);
    ASSERT_EQ(f.model, fit_model::offset);
    EXPECT_GE(truth, f.decay_constant_ci_low_per_m);
    EXPECT_LE(truth, f.decay_constant_ci_high_per_m);
    EXPECT_LE(std::abs(f.offset_A - t.baseline_A), f.t_quantile * f.offset_stderr_A);
    EXPECT_LT(f.offset_stderr_A, 0.5e-12);  // the offset is measured, not merely bounded
    const fit_result line = fit_curve(m, fit_options{.model = fit_model::linear}).at(0);
    EXPECT_LT(line.decay_constant_per_m, 0.95 * truth);       // the offset biases the line low
    EXPECT_LT(line.decay_constant_ci_high_per_m, truth);      // and its interval misses the truth
    std::printf("offset %.3f +- %.3f pA (truth 3); kappa %.4f +- %.4f /nm (truth %.4f); line %.4f /nm\n",
                f.offset_A * 1e12, f.offset_stderr_A * 1e12, f.decay_constant_per_m * 1e-9,
                f.decay_constant_stderr_per_m * 1e-9, truth * 1e-9, line.decay_constant_per_m * 1e-9);
}

// A demo curve's <stem>.fit.yaml: `model: offset` changes the fit; a bad value or an unknown key
// is an input error at its file, line and key.
TEST(demo_scans, fit_options_file_is_read_and_checked) {
    const fs::path dir = fs::temp_directory_path() / fs::path("tipgap_demo_fit_yaml_" + std::to_string(::getpid()));
    fs::remove_all(dir);
    fs::create_directories(dir);
    const fs::path src = fs::path(TIPGAP_SOURCE_DIR) / "demo_scans";
    fs::copy_file(src / "01_w_au111_clean.csv", dir / "01_w_au111_clean.csv");
    demo_options o;
    o.scans_dir = dir.string();
    o.model_comparison = false;
    o.resonances = false;
    EXPECT_EQ(run_demo(o).curves.at(0).fit.model, fit_model::linear);  // no .fit.yaml: the linear model
    auto write = [&](const std::string& text) {
        std::FILE* f = std::fopen((dir / "01_w_au111_clean.fit.yaml").c_str(), "w");
        ASSERT_NE(f, nullptr);
        std::fputs(text.c_str(), f);
        std::fclose(f);
    };
    write("# comment\nmodel: offset\n");
    const demo_report r = run_demo(o);
    EXPECT_EQ(r.curves.at(0).fit.model, fit_model::offset);
    EXPECT_FALSE(r.curves.at(0).model.has_value());
    write("# comment\nmodel: cubic\n");
    try {
        run_demo(o);
        ADD_FAILURE() << "a bad model was accepted";
    } catch (const error& e) {
        EXPECT_EQ(e.where().line, 2);
        EXPECT_EQ(e.where().key, "model");
        EXPECT_EQ(e.detail(), "'cubic' is not a fit model; expected linear or offset");
    }
    write("modle: offset\n");
    try {
        run_demo(o);
        ADD_FAILURE() << "an unknown key was accepted";
    } catch (const error& e) {
        EXPECT_EQ(e.where().key, "modle");
        EXPECT_EQ(e.detail(), "unknown key; expected: model");
    }
    fs::remove_all(dir);
}
