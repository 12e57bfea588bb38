// The shipped demo curves (demo_scans/, made by tipgap synth): fit recovers their ground truth.
#include <gtest/gtest.h>

#include <cstdio>
#include <filesystem>
#include <vector>

#include "tipgap/fit/fit.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/synth/synth.hpp"

using namespace tipgap;
namespace fs = std::filesystem;

// Ground-truth recovery on the shipped demo curves: for every sweep, the synthesiser's expected κ
// (noise-free, with the instrument's drift and baseline) lies inside the fit's 95 % interval
// (fit's own t quantile and standard error). Eight sweeps at 95 %: all inside is expected most of
// the time; these seeds are fixed, and demo_scans/make_demo_scans.sh regenerates the same files.
TEST(demo_scans, fit_recovers_truth_within_stated_uncertainty) {
    const fs::path dir = fs::path(TIPGAP_SOURCE_DIR) / "demo_scans";
    std::size_t sweeps = 0;
    for (const fs::directory_entry& e : fs::directory_iterator(dir)) {
        if (e.path().extension() != ".csv") continue;
        const measured_curve m = read_curve_csv(e.path().string());
        const truth_record t = read_truth(truth_path_for(e.path().string()));
        const std::vector<fit_result> fits = fit_curve(m, fit_options{});
        ASSERT_EQ(fits.size(), t.sweeps.size()) << e.path();
        for (std::size_t k = 0; k < fits.size(); ++k) {
            ++sweeps;
            const double truth = t.sweeps[k].decay_constant_expected_per_m;
            EXPECT_EQ(fits[k].direction, t.sweeps[k].direction);
            EXPECT_GE(truth, fits[k].decay_constant_ci_low_per_m) << e.path() << " sweep " << k;
            EXPECT_LE(truth, fits[k].decay_constant_ci_high_per_m) << e.path() << " sweep " << k;
            std::printf("%s %s: kappa %.4f +- %.4f, truth %.4f /nm\n", e.path().filename().c_str(),
                        to_string(fits[k].direction), fits[k].decay_constant_per_m * 1e-9,
                        fits[k].decay_constant_stderr_per_m * 1e-9, truth * 1e-9);
        }
    }
    EXPECT_GE(sweeps, 8u);
}
