// Tests for the synthesiser (determinism, noise statistics, clipping, drift, contact, grids).
// (The model comparison fit is tested in tests/fit/model_fit_test.cpp, the shipped demo curves in
// tests/demo/demo_scans_test.cpp.)
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <unistd.h>

#include <fmt/format.h>

#include "tipgap/core/constants.hpp"
#include "tipgap/fit/fit.hpp"
#include "support/synth_sweep.hpp"
#include "tipgap/synth/synth.hpp"

using namespace tipgap;
using tipgap_test::as_sweep;
namespace fs = std::filesystem;

namespace {

constexpr double nm_ = 1e-9;
constexpr double pA = 1e-12;
constexpr double eV_ = si::electron_volt;

std::string slurp(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    std::stringstream s;
    s << in.rdbuf();
    return s.str();
}

fs::path scratch(const std::string& name) {
    fs::path d = fs::temp_directory_path() / fmt::format("tipgap-synth-test-{}-{}", ::getpid(), name);
    fs::create_directories(d);
    return d;
}


}  // namespace

TEST(synth, same_seed_same_file_other_seed_other_noise) {
    const config c = default_config();
    synth_options o;
    o.current_noise_A = 1 * pA;
    o.seed = 42;
    const synth_curve a = synthesise_curve(c, o), b = synthesise_curve(c, o);
    ASSERT_EQ(a.samples.size(), 121u);
    for (std::size_t k = 0; k < a.samples.size(); ++k) ASSERT_EQ(a.samples[k].current_A, b.samples[k].current_A) << k;
    o.seed = 43;
    const synth_curve d = synthesise_curve(c, o);
    std::size_t differ = 0;
    for (std::size_t k = 0; k < a.samples.size(); ++k) differ += a.samples[k].current_A != d.samples[k].current_A;
    EXPECT_EQ(differ, a.samples.size());

    // Written twice: byte-identical files.
    const fs::path dir = scratch("determinism");
    o.seed = 42;
    write_synth_curve(a, c, o, (dir / "a.csv").string(), (dir / "a.truth.yaml").string(), "cmd");
    const std::string first = slurp((dir / "a.csv").string()), first_truth = slurp((dir / "a.truth.yaml").string());
    write_synth_curve(synthesise_curve(c, o), c, o, (dir / "a.csv").string(), (dir / "a.truth.yaml").string(), "cmd");
    EXPECT_EQ(first, slurp((dir / "a.csv").string()));
    EXPECT_EQ(first_truth, slurp((dir / "a.truth.yaml").string()));
    EXPECT_NE(first.find("# bias: 0.1 V\n"), std::string::npos);
    EXPECT_NE(first.find("\nz [nm],current [pA]\n"), std::string::npos);
    // The file reads back through the project's reader with its metadata.
    const measured_curve m = read_curve_csv((dir / "a.csv").string());
    ASSERT_EQ(m.z_m.size(), 121u);
    EXPECT_DOUBLE_EQ(*m.metadata.bias_V, 0.1);
    // 7 significant digits in pA: relative rounding below 5e-7 (plus 0.5e-6 pA absolute).
    for (std::size_t k = 0; k < 121; ++k)
        EXPECT_NEAR(m.current_A[k], a.samples[k].current_A, 5e-7 * std::abs(a.samples[k].current_A) + 1e-18) << k;
    const truth_record t = read_truth((dir / "a.truth.yaml").string());
    EXPECT_EQ(t.seed, 42u);
    EXPECT_DOUBLE_EQ(t.current_noise_A, 1 * pA);
    // The built-in default: tungsten 4.55 eV and gold 5.31 eV (configs/materials.yaml), mean 4.93 eV.
    EXPECT_NEAR(t.mean_work_function_J, 4.93 * eV_, 1e-9 * eV_);
    ASSERT_EQ(t.sweeps.size(), 1u);
    EXPECT_NEAR(t.sweeps[0].decay_constant_expected_per_m, a.truth.sweeps[0].decay_constant_expected_per_m,
                1e-8 * a.truth.sweeps[0].decay_constant_expected_per_m);  // 9 digits in the YAML
    fs::remove_all(dir);
}

// The white noise has the requested σ and the floor its baseline. The residual I - I_model is
// baseline + σ n with n standard normal, so over N samples the sample standard deviation has a
// relative standard error 1/sqrt(2(N-1)) and the mean a standard error σ/sqrt(N) (normal-sample
// theory, e.g. NIST/SEMATECH e-Handbook of Statistical Methods, sections 1.3.5.8 and 7.2.2; from
// memory). With N = 20000: 0.5 % and 0.007 σ.
TEST(synth, white_noise_matches_requested_sigma_and_baseline) {
    const config c = default_config();
    synth_options o;
    o.points = 20000;
    o.current_noise_A = 2 * pA;
    o.baseline_A = 1.5 * pA;
    o.seed = 7;
    const synth_curve s = synthesise_curve(c, o);
    double sum = 0, sum2 = 0;
    for (const synth_sample& p : s.samples) sum += p.current_A - p.model_current_A;
    const double n = static_cast<double>(s.samples.size());
    const double mean = sum / n;
    for (const synth_sample& p : s.samples) sum2 += std::pow(p.current_A - p.model_current_A - mean, 2);
    const double sd = std::sqrt(sum2 / (n - 1));
    // 4 standard errors: a correct generator fails this with probability 6e-5 (for this fixed seed:
    // never, but a broken one, e.g. σ off by 2 %, fails).
    constexpr double kSdRel = 4.0 / 200.0;  // 4 / sqrt(2 (N - 1)) rounded up
    EXPECT_NEAR(sd, 2 * pA, kSdRel * 2 * pA);
    EXPECT_NEAR(mean, 1.5 * pA, 4.0 * 2 * pA / std::sqrt(n));
    std::printf("noise: sd %.4f pA (asked 2), mean %.4f pA (asked 1.5)\n", sd / pA, mean / pA);
}

TEST(synth, saturation_clips_and_contact_jumps_to_the_plateau) {
    const config c = default_config();
    synth_options o;
    o.gap_min_m = 0.25 * nm_;
    o.gap_max_m = 0.8 * nm_;
    o.bias_V = 0.01;
    o.jump_gap_m = 0.38 * nm_;
    o.current_noise_A = 0.2 * pA;
    o.seed = 3;
    synth_curve s = synthesise_curve(c, o);
    const double plateau = si::conductance_quantum * 0.01;  // 1 G0 at 10 mV
    std::size_t in_contact = 0;
    for (const synth_sample& p : s.samples) {
        EXPECT_EQ(p.in_contact, p.true_gap_m < 0.38 * nm_);
        if (p.in_contact) {
            ++in_contact;
            EXPECT_NEAR(p.current_A, plateau, 6 * 0.2 * pA);  // plateau + noise, 6 σ
        }
    }
    EXPECT_GT(in_contact, 10u);
    // Truth: the jump in recorded z, drift-free.
    EXPECT_NEAR(s.truth.jump_z_m, 0.38 * nm_ - 0.25 * nm_, 1e-15);

    // Contact detection by the fitter on this synthetic jump: kind, and position within one
    // sample step of the truth (the fitter puts it halfway between the last contact point and the
    // first tunnelling point).
    const double step = (o.gap_max_m - o.gap_min_m) / static_cast<double>(o.points - 1);
    const fit_result f = fit_sweep(as_sweep(s, 0, s.samples.size()), o.bias_V, fit_options{});
    EXPECT_NE(f.contact.kind, contact_kind::none);
    EXPECT_NEAR(f.contact.z_m, s.truth.jump_z_m, step);
    EXPECT_NEAR(f.contact.conductance_G0, 1.0, 0.01);
    EXPECT_EQ(f.contact.points_in_contact, in_contact);
    EXPECT_FALSE(f.saturation_detected);  // the plateau is not an amplifier flat top

    o.jump_gap_m = 0.0;
    o.saturation_A = 10e-9;
    o.bias_V = 0.1;
    s = synthesise_curve(c, o);
    std::size_t clipped = 0;
    for (const synth_sample& p : s.samples) {
        EXPECT_LE(p.current_A, 10e-9);
        clipped += p.current_A == 10e-9;
    }
    EXPECT_GT(clipped, 10u);
}

// Piezo drift d over a single retract sweep of range R: the true gap is z·(1 + d/R) + const, so
// the slope the fit sees is the model's times (1 + d/R) (chain rule). The model's κ varies along
// the range (image potential) and the weights shift a little with the drift, so the agreement is
// not exact: measured 6e-6 relative; tolerance 1e-4.
TEST(synth, drift_scales_the_expected_decay_constant) {
    const config c = default_config();
    synth_options o;
    o.gap_min_m = 0.6 * nm_;
    o.gap_max_m = 1.0 * nm_;
    o.drift_m = 0.02 * nm_;
    const synth_curve s = synthesise_curve(c, o);
    const synth_sweep_truth& t = s.truth.sweeps[0];
    const double ratio = t.decay_constant_expected_per_m / t.decay_constant_model_per_m;
    constexpr double kDrift = 1e-4;
    EXPECT_NEAR(ratio, 1.0 + 0.02 / 0.4, kDrift);
    std::printf("drift ratio %.6f, chain rule %.6f\n", ratio, 1.0 + 0.02 / 0.4);
}

// Approach/retract: two sweeps in file order with a direction column.
TEST(synth, approach_retract_pair_reads_back_as_two_sweeps) {
    const config c = default_config();
    synth_options o;
    o.sweeps = synth_sweeps::approach_retract;
    o.points = 40;
    o.current_noise_A = 0.1 * pA;
    const fs::path dir = scratch("pair");
    write_synth_curve(synthesise_curve(c, o), c, o, (dir / "p.csv").string(), (dir / "p.truth.yaml").string());
    const measured_curve m = read_curve_csv((dir / "p.csv").string());
    EXPECT_TRUE(m.has_direction_column);
    ASSERT_EQ(m.sweeps.size(), 2u);
    EXPECT_EQ(m.sweeps[0].direction, sweep_direction::approach);
    EXPECT_EQ(m.sweeps[1].direction, sweep_direction::retract);
    EXPECT_EQ(m.sweeps[1].first_row, 40u);
    fs::remove_all(dir);
}

TEST(synth, grid_rows_regions_and_determinism) {
    const config c = default_config();
    synth_options o;
    o.points = 16;
    o.current_noise_A = 0.5 * pA;
    o.seed = 9;
    synth_grid_options g;
    g.nx = 9;
    g.ny = 7;
    g.pitch_m = 1 * nm_;
    g.disc_radius_m = 2.5 * nm_;
    g.disc_work_function_J = 4.3 * eV_;
    const fs::path dir = scratch("grid");
    const std::string csv = (dir / "g.csv").string(), yaml = (dir / "g.truth.yaml").string();
    const synth_grid_truth t = write_synth_grid(c, o, g, csv, yaml);
    const std::string text = slurp(csv);
    write_synth_grid(c, o, g, csv, yaml);
    EXPECT_EQ(text, slurp(csv));
    // Pixels in the disc, counted directly: centre (4, 3) nm, radius 2.5 nm.
    std::size_t inside = 0;
    for (int iy = 0; iy < 7; ++iy)
        for (int ix = 0; ix < 9; ++ix) inside += std::hypot(ix - 4.0, iy - 3.0) <= 2.5;
    ASSERT_EQ(t.regions.size(), 2u);
    EXPECT_EQ(t.regions[1].pixels, inside);
    EXPECT_EQ(t.regions[0].pixels + t.regions[1].pixels, 63u);
    EXPECT_EQ(t.rows, 63u * 16u);
    // The lower work function gives the lower apparent barrier.
    EXPECT_LT(t.regions[1].apparent_barrier_expected_J, t.regions[0].apparent_barrier_expected_J - 0.3 * eV_);
    // One header, then one row per sample, pixel by pixel: row 17 is pixel (1, 0), its first z.
    std::istringstream in(text);
    std::string line;
    std::size_t rows = 0;
    bool header = false;
    std::string row17;
    while (std::getline(in, line)) {
        if (line.starts_with("#")) continue;
        if (!header) {
            EXPECT_EQ(line, "x [nm],y [nm],z [nm],current [pA]");
            header = true;
            continue;
        }
        if (++rows == 17) row17 = line;
    }
    EXPECT_EQ(rows, 63u * 16u);
    EXPECT_TRUE(row17.starts_with("1,0,0.0000,")) << row17;
    fs::remove_all(dir);
}

// Gap jitter: the recorded current is the model at a gap moved by σ_z·m_k, so
// ln(I/I_m) ≈ −2κ(s)·σ_z·m_k with κ(s) the model's local decay constant: divided by −2κσ_z, the
// log ratio must be a standard normal sample (first order in 2κσ_z = 0.04; the second-order term
// shifts the mean by ~1e-3, inside the tolerance). 4 standard errors, as above.
TEST(synth, gap_jitter_gives_noise_proportional_to_the_current) {
    const config c = default_config();
    synth_options o;
    o.points = 20000;
    o.gap_jitter_m = 2e-12;
    o.seed = 11;
    const synth_curve s = synthesise_curve(c, o);
    double sum = 0, sum2 = 0;
    std::size_t n = 0;
    for (std::size_t k = 0; k + 1 < s.samples.size(); ++k) {
        const synth_sample& p = s.samples[k];
        const synth_sample& q = s.samples[k + 1];
        const double two_kappa = -std::log(q.model_current_A / p.model_current_A) / (q.true_gap_m - p.true_gap_m);
        const double u = std::log(p.current_A / p.model_current_A) / (-two_kappa * o.gap_jitter_m);
        sum += u;
        sum2 += u * u;
        ++n;
    }
    const double mean = sum / static_cast<double>(n);
    const double sd = std::sqrt((sum2 - sum * mean) / static_cast<double>(n - 1));
    EXPECT_NEAR(sd, 1.0, 4.0 / 200.0);
    EXPECT_NEAR(mean, 0.0, 4.0 / std::sqrt(static_cast<double>(n)));
    std::printf("gap jitter: normalised log ratio sd %.4f, mean %.4f\n", sd, mean);
    // Without jitter the deviates are the same as before the option existed: the current noise alone.
    o.gap_jitter_m = 0.0;
    for (const synth_sample& p : synthesise_curve(c, o).samples) EXPECT_EQ(p.current_A, p.model_current_A);
}
