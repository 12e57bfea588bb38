// _predict and _plan: the forward model and the setpoint planner on flat arrays of points, each
// row built from the same declared columns as `tipgap predict` and `tipgap plan` JSON points.
#include <fmt/format.h>
#include <utility>
#include <vector>

#include "bindings.hpp"
#include "convert.hpp"
#include "keywords.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/plan_columns.hpp"
#include "tipgap/plan/predict.hpp"
#include "tipgap/plan/predict_columns.hpp"
#include "tipgap/plan/uncertainty.hpp"

namespace tipgap::python {

namespace {

struct run_options {
    int threads = 0;
    uncertainty_options uncertainty;
};

run_options checked(int threads, int mc_samples, std::uint64_t seed) {
    run_options r;
    if (threads < 0) throw_input(location{"", 0, 0, "threads"}, fmt::format("{} is not a thread count; expected 0 (all cores) or more", threads));
    r.threads = threads;
    r.uncertainty.samples = mc_samples;
    r.uncertainty.seed = seed;
    r.uncertainty.threads = threads;
    r.uncertainty.validate();
    return r;
}

std::vector<std::pair<double, double>> pairs(const std::vector<double>& a, const std::vector<double>& b) {
    if (a.size() != b.size()) throw std::logic_error("arrays of different sizes (the package broadcasts them)");
    std::vector<std::pair<double, double>> out;
    out.reserve(a.size());
    for (std::size_t i = 0; i < a.size(); ++i) out.emplace_back(a[i], b[i]);
    return out;
}

// The points of `tipgap predict`: predictions and, with uncertain config inputs, their uncertainty.
std::vector<record> predict_rows(const config& c, const std::vector<std::pair<double, double>>& points, const run_options& o) {
    const auto results = predict_points(c, points, o.threads);
    std::vector<uncertainty_summary> u(results.size());
    if (c.sigma.any())
        for (std::size_t i = 0; i < points.size(); ++i) u[i] = predict_uncertainty(c, points[i].first, points[i].second, o.uncertainty);
    const bool with_u = c.sigma.any() && !u.empty() && !u.front().inputs.empty();
    const auto columns = predict_columns(with_u ? u.front().names : std::vector<std::string>{});
    std::vector<record> rows;
    rows.reserve(results.size());
    for (std::size_t i = 0; i < results.size(); ++i) rows.push_back(to_record(columns, predict_row{&results[i], &u[i]}));
    return rows;
}

// The points of `tipgap plan`.
std::vector<record> plan_rows(const config& c, const std::vector<std::pair<double, double>>& setpoints, const run_options& o) {
    const plan_options options;
    const auto points = plan_setpoints(c, setpoints, options, o.threads);
    std::vector<uncertainty_summary> u(points.size());
    std::vector<std::string> names;
    if (c.sigma.any()) {
        for (std::size_t i = 0; i < points.size(); ++i)
            if (points[i].reachable()) u[i] = plan_uncertainty(c, points[i].setpoint_A, points[i].bias_V, options, o.uncertainty);
        for (const auto& x : u)
            if (!x.names.empty() && names.empty()) names = x.names;
    }
    const auto columns = plan_columns(names);
    std::vector<record> rows;
    rows.reserve(points.size());
    for (std::size_t i = 0; i < points.size(); ++i) rows.push_back(to_record(columns, plan_row{&points[i], &u[i]}));
    return rows;
}

py::dict predict(const config& c, const double_array& gap_nm, const double_array& bias_V, int threads, int mc_samples,
                 std::uint64_t seed) {
    const run_options o = naming_keywords("predict", [&] { return checked(threads, mc_samples, seed); });
    // nm -> m as the CLI's unit parser does ("0.6nm" is 0.6 * 1e-9).
    const auto points = pairs(scaled_vector(gap_nm, 1e-9), to_vector(bias_V));
    std::vector<record> rows;
    {
        py::gil_scoped_release unlocked;
        rows = naming_keywords("predict", [&] { return predict_rows(c, points, o); });
    }
    if (rows.empty()) {
        const prediction p;
        const uncertainty_summary u;
        return empty_columns(to_record(predict_columns({}), predict_row{&p, &u}));
    }
    return to_columns(rows);
}

py::dict plan(const config& c, const double_array& current_A, const double_array& bias_V, int threads, int mc_samples,
              std::uint64_t seed) {
    const run_options o = naming_keywords("plan", [&] { return checked(threads, mc_samples, seed); });
    const auto setpoints = pairs(to_vector(current_A), to_vector(bias_V));
    std::vector<record> rows;
    {
        py::gil_scoped_release unlocked;
        rows = naming_keywords("plan", [&] { return plan_rows(c, setpoints, o); });
    }
    if (rows.empty()) {
        const plan_point p;
        const uncertainty_summary u;
        return empty_columns(to_record(plan_columns({}), plan_row{&p, &u}));
    }
    return to_columns(rows);
}

}  // namespace

void bind_plan(py::module_& m) {
    m.def("_predict", &predict, py::arg("config"), py::arg("gap_nm"), py::arg("bias_V"), py::arg("threads"),
          py::arg("mc_samples"), py::arg("seed"));
    m.def("_plan", &plan, py::arg("config"), py::arg("current_A"), py::arg("bias_V"), py::arg("threads"),
          py::arg("mc_samples"), py::arg("seed"));
}

}  // namespace tipgap::python
