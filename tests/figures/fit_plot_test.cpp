// The fit figure (issue 15): log10 of the current in the data's unit, bands that show, file names
// from the input stems and titles with base names.
#include <gtest/gtest.h>

#include <cmath>
#include <string>
#include <variant>

#include "tipgap/figures/fit_plot.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/io/curve_io.hpp"

using namespace tipgap;

namespace {

// log10 and ln of the same number agree to rounding: a few ulps of values near 1.
constexpr double kRounding = 1e-12;

struct fitted {
    measured_curve curve;
    fit_result fit;
};

fitted clean_demo_fit() {
    fitted f{read_curve_csv(std::string(TIPGAP_SOURCE_DIR) + "/demo_scans/01_w_au111_clean.csv"), {}};
    f.fit = fit_curve(f.curve, fit_options{}).at(0);
    return f;
}

}  // namespace

TEST(fit_plot, current_axis_is_log10_in_the_data_unit) {
    const fitted f = clean_demo_fit();
    const curve_sweep& sw = f.curve.sweeps.at(0);
    const plot::figure fig = make_fit_figure(sw, f.fit, nullptr, "t");
    const auto& top = std::get<plot::xy_panel>(fig.panels.at(0));
    // The demo curve peaks below 10 nA: the unit is nA (pA below 1 nA, µA from 1 µA).
    double peak = 0;
    for (double I : sw.current_A) peak = std::max(peak, std::abs(I));
    ASSERT_GT(peak, 1e-9);
    ASSERT_LT(peak, 1e-6);
    EXPECT_EQ(top.y_axis.label, "log₁₀(|I| / 1 nA)");
    EXPECT_EQ(top.y_axis.scale, plot::axis_scale::linear);
    // The first used point is log10(|I| / 1 nA) of its row, not ln(|I| / 1 A).
    const plot::series& used = top.lines.at(0);
    std::size_t first = sw.z_m.size();
    for (std::size_t i = 0; i < sw.z_m.size(); ++i)
        if (std::abs(sw.current_A[i]) > 0) {
            first = i;
            break;
        }
    ASSERT_LT(first, sw.z_m.size());
    EXPECT_NEAR(used.y.at(0), std::log10(std::abs(sw.current_A[first]) * 1e9), kRounding);
    // The residual panel is in decades too: ln residual / ln 10.
    const auto& mid = std::get<plot::xy_panel>(fig.panels.at(1));
    EXPECT_EQ(mid.y_axis.label, "log₁₀|I| − fit");
}

TEST(fit_plot, bands_are_present_wide_and_grey_around_the_fit) {
    const fitted f = clean_demo_fit();
    const plot::figure fig = make_fit_figure(f.curve.sweeps.at(0), f.fit, nullptr, "t");
    for (std::size_t panel : {0u, 1u}) {
        const auto& p = std::get<plot::xy_panel>(fig.panels.at(panel));
        ASSERT_EQ(p.bands.size(), 2u) << "panel " << panel;
        const plot::band& wide = p.bands[0];
        const plot::band& narrow = p.bands[1];
        EXPECT_EQ(wide.fill, plot::band_fill::grey);
        EXPECT_EQ(narrow.fill, plot::band_fill::tint);
        EXPECT_EQ(wide.label, "95 % of points");
        EXPECT_EQ(narrow.label, "95 % confidence of the fit");
        ASSERT_FALSE(wide.x.empty());
        for (std::size_t k = 0; k < wide.x.size(); ++k) {
            EXPECT_LT(wide.y_low[k], narrow.y_low[k]);
            EXPECT_GT(wide.y_high[k], narrow.y_high[k]);
        }
    }
    // On the residual panel the band that holds 95 % of the points spans at least the noise model's
    // σ/I on each side (t > 1), in decades, at the closest point: σ² = σ_I² + (ε μ)².
    const auto& mid = std::get<plot::xy_panel>(fig.panels.at(1));
    const double mu = f.fit.prefactor_A, eps = f.fit.relative_noise;
    const double sigma_decades = std::sqrt(std::pow(f.fit.current_noise_A, 2) + std::pow(eps * mu, 2)) /
                                 (mu + f.fit.offset_A) / std::log(10.0);
    EXPECT_GT(mid.bands[0].y_high[0], sigma_decades);
    EXPECT_LT(mid.bands[0].y_low[0], -sigma_decades);
    // The linear model's bands: the same two, around its line.
    const fitted lin{f.curve, fit_curve(f.curve, fit_options{.model = fit_model::linear}).at(0)};
    const plot::figure lf = make_fit_figure(lin.curve.sweeps.at(0), lin.fit, nullptr, "t");
    EXPECT_EQ(std::get<plot::xy_panel>(lf.panels.at(0)).bands.size(), 2u);
    const double rms_decades = lin.fit.residual_rms_ln / std::log(10.0);
    EXPECT_GT(std::get<plot::xy_panel>(lf.panels.at(1)).bands[0].y_high[0], rms_decades);
}

TEST(fit_plot, several_sweeps_are_named_after_their_input_stems) {
    const std::vector<fit_plot_source> two_files{{"/data/run7.csv", sweep_direction::retract},
                                                 {"other/run8.csv", sweep_direction::approach}};
    EXPECT_EQ(fit_plot_paths("out/fit.png", two_files), (std::vector<std::string>{"out/fit-run7.png", "out/fit-run8.png"}));
    const std::vector<fit_plot_source> pair{{"a/pair.csv", sweep_direction::approach}, {"a/pair.csv", sweep_direction::retract}};
    EXPECT_EQ(fit_plot_paths("fit.svg", pair), (std::vector<std::string>{"fit-pair-approach.svg", "fit-pair-retract.svg"}));
    // The same stem in two directories: the second gets a number rather than overwriting the first.
    const std::vector<fit_plot_source> clash{{"a/x.csv", sweep_direction::retract}, {"b/x.csv", sweep_direction::retract}};
    EXPECT_EQ(fit_plot_paths("fit.png", clash), (std::vector<std::string>{"fit-x.png", "fit-x-2.png"}));
    // One sweep: the path as given.
    EXPECT_EQ(fit_plot_paths("my.png", {{"a/x.csv", sweep_direction::retract}}), (std::vector<std::string>{"my.png"}));
}

TEST(fit_plot, title_uses_the_base_name) {
    EXPECT_EQ(fit_plot_title({"/home/someone/scans/run7.csv", sweep_direction::approach}), "run7.csv (approach)");
}
