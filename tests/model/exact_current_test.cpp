// Current density with `method: exact`: its tolerance contract, symmetry, and the J_exact/J_wkb
// ratios quoted in README.md ("Exact transmission").
#include <gtest/gtest.h>

#include <cmath>
#include <fmt/format.h>

#include "support/reference_junction.hpp"
#include "tipgap/config/config.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/current.hpp"
#include "tipgap/model/exact_transmission.hpp"

using namespace tipgap;

namespace {
model_options exact_junction(image_kind image = image_kind::exact) {
    model_options o = tipgap_test::reference_junction().model;  // W 4.5/9.0 eV tip, Au 5.3/5.5 eV sample, 4.2 K
    o.method = method_kind::exact;
    o.image = image;
    return o;
}
}  // namespace

// The default tolerance (1e-6) holds against a 1e-10 solution across direct tunnelling, field
// emission and the resonance regime (7 and 9.5 V), at 0, 4.2 and 300 K.
TEST(exact_current, default_tolerance_holds_against_tight_solution) {
    double worst = 0.0;
    for (double T : {0.0, 4.2, 300.0})
        for (double s : {0.5e-9, 1e-9, 1.5e-9})
            for (double V : {-2.0, 0.01, 0.5, 3.0, 7.0, 9.5}) {
                model_options o = exact_junction();
                o.temperature_K = T;
                const double loose = current_density(o, s, V);
                o.rel_tol = 1e-10;
                const double tight = current_density(o, s, V);
                worst = std::max(worst, std::abs(loose / tight - 1.0));
                EXPECT_NEAR(loose / tight, 1.0, exact_junction().rel_tol) << T << " K, " << s << " m, " << V << " V";
            }
    RecordProperty("worst_relative_error", fmt::format("{:.2e}", worst));
}

// Identical electrodes and the symmetric image potential: T(E) is the same barrier mirrored, so
// J(-V) = -J(V) (the two solutions differ only by their tolerances).
TEST(exact_current, identical_electrodes_give_odd_current) {
    model_options o = exact_junction();
    o.sample = o.tip;
    for (double s : {0.6e-9, 1.2e-9})
        for (double V : {0.05, 1.0, 6.0}) {
            EXPECT_NEAR(-current_density(o, s, -V) / current_density(o, s, V), 1.0, 2.0 * o.rel_tol) << s << " " << V;
        }
    EXPECT_EQ(current_density(o, 1e-9, 0.0), 0.0);
}

// README.md, "Exact transmission": J_exact/J_wkb quoted to two decimals (4.2 K, built-in junction).
// Agreement to 0.005 is all that the quotation allows.
constexpr double kQuoted2 = 0.005;

TEST(exact_current, ratio_to_wkb_matches_readme_table) {
    struct row {
        image_kind image;
        double gap_nm, bias_V, ratio;
    };
    const row rows[] = {
        {image_kind::exact, 0.4, 0.01, 1.77}, {image_kind::exact, 0.8, 1.0, 1.50},
        {image_kind::exact, 1.2, 3.0, 0.88},  {image_kind::exact, 1.0, -1.0, 1.41},
        {image_kind::none, 0.4, 0.01, 3.71},  {image_kind::none, 1.0, 1.0, 3.86},
        {image_kind::none, 1.2, 3.0, 3.46},
    };
    for (const row& r : rows) {
        model_options e = exact_junction(r.image);
        model_options w = e;
        w.method = method_kind::wkb;
        const double ratio = current_density(e, r.gap_nm * 1e-9, r.bias_V) / current_density(w, r.gap_nm * 1e-9, r.bias_V);
        EXPECT_NEAR(ratio, r.ratio, kQuoted2) << to_string(r.image) << " " << r.gap_nm << " nm " << r.bias_V << " V";
    }
}
