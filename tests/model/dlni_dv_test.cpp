// d ln|I|/dV, the field of point_quantities that `predict` reports (issue 12).
#include <gtest/gtest.h>

#include <cmath>

#include "tipgap/config/config.hpp"
#include "tipgap/model/current.hpp"
#include "tipgap/model/geometry.hpp"
#include "tipgap/plan/predict.hpp"

using namespace tipgap;

// Against ln J differenced independently with a small step: the central difference is O(h^2), so a
// 1e-4 V step and rel_tol 1e-10 leave < 1e-6 relative; evaluate_point's own step (1 % or 0.2 % of V)
// leaves ~(h/V)^2 ~ 1e-4 for a smooth J(V), so 1e-3 relative.
constexpr double kStepError = 1e-3;

TEST(dlnI_dV, equals_log_derivative_of_current_density) {
    for (method_kind m : {method_kind::wkb, method_kind::exact}) {
        model_options o = default_config().model;
        o.method = m;
        o.rel_tol = 1e-10;
        for (double V : {-1.0, 0.1, 2.0}) {
            const double s = 0.8e-9, h = 1e-4;
            const double want =
                (std::log(std::abs(current_density(o, s, V + h))) - std::log(std::abs(current_density(o, s, V - h)))) /
                (2.0 * h);
            EXPECT_NEAR(evaluate_point(o, s, V).dlnI_dV_per_V / want, 1.0, kStepError) << to_string(m) << " " << V;
        }
    }
}

TEST(dlnI_dV, is_nan_at_zero_bias) {
    EXPECT_TRUE(std::isnan(evaluate_point(default_config().model, 1e-9, 0.0).dlnI_dV_per_V));
}

// A paraboloid tip adds J from larger local gaps, whose bias dependence differs from the apex's:
// predict must report the total current's own derivative, not the planar one.
TEST(dlnI_dV, paraboloid_uses_total_current) {
    config c = default_config();
    c.geometry.kind = geometry_kind::paraboloid;
    c.geometry.apex_radius_m = 5e-9;
    const double s = 0.8e-9, V = 1.5, h = 1e-3;
    const auto p = predict_points(c, {{s, V}}, 1).front();
    const double want = (std::log(total_current(c.model, c.geometry, s, V + h)) -
                         std::log(total_current(c.model, c.geometry, s, V - h))) /
                        (2.0 * h);
    EXPECT_NEAR(p.q.dlnI_dV_per_V / want, 1.0, kStepError);
    EXPECT_GT(std::abs(p.q.dlnI_dV_per_V / evaluate_point(c.model, s, V).dlnI_dV_per_V - 1.0), 1e-3)
        << "the paraboloid value differs from the planar one";
}
