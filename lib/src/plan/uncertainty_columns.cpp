#include "tipgap/plan/uncertainty_columns.hpp"

#include <cmath>
#include <fmt/format.h>
#include <fmt/ranges.h>
#include <limits>

namespace tipgap {

double standard_uncertainty(const uncertainty_summary& u, std::size_t k) {
    if (u.inputs.empty() || k >= u.values.size()) return std::numeric_limits<double>::quiet_NaN();
    return u.samples > 0 ? u.values[k].mc_stddev : u.values[k].linear_stddev;
}

namespace {

// Uncertainty of each output as JSON keys (see the header).
record uncertainty_record(const uncertainty_summary& u) {
    record r;
    for (std::size_t k = 0; k < u.names.size() && k < u.values.size(); ++k) {
        const uncertain_value& v = u.values[k];
        const std::string& n = u.names[k];
        if (u.samples > 0) {
            r.set(n + "_stddev", v.mc_stddev);
            r.set(n + "_ci95", cell::list{v.ci95_low, v.ci95_high});
            r.set(n + "_mc_mean", v.mc_mean);
        }
        if (!std::isnan(v.linear_stddev) || !std::isnan(v.linear_ci95_low)) {
            r.set(n + "_linear_stddev", v.linear_stddev);
            r.set(n + "_linear_ci95", cell::list{v.linear_ci95_low, v.linear_ci95_high});
        }
    }
    return r;
}

// Output k's field of a summary with uncertain inputs, else NaN.
template <double uncertain_value::*field>
cell value_of(const uncertainty_summary& u, std::size_t k) {
    if (u.inputs.empty() || k >= u.values.size()) return std::numeric_limits<double>::quiet_NaN();
    return u.values[k].*field;
}

}  // namespace

std::vector<column<uncertainty_summary>> uncertainty_columns(const std::vector<std::string>& names) {
    using row = uncertainty_summary;
    std::vector<column<row>> out;
    for (std::size_t k = 0; k < names.size(); ++k) {
        const std::string& n = names[k];
        out.push_back({n + "_stddev", "", [k](const row& u) { return value_of<&uncertain_value::mc_stddev>(u, k); }, {}, {}, in_csv});
        out.push_back({n + "_ci95_low", "", [k](const row& u) { return value_of<&uncertain_value::ci95_low>(u, k); }, {}, {}, in_csv});
        out.push_back({n + "_ci95_high", "", [k](const row& u) { return value_of<&uncertain_value::ci95_high>(u, k); }, {}, {}, in_csv});
        out.push_back({n + "_linear_stddev", "", [k](const row& u) { return value_of<&uncertain_value::linear_stddev>(u, k); }, {}, {}, in_csv});
    }
    out.push_back({"", "", [](const row& u) { return u.inputs.empty() ? cell(absent{}) : cell(uncertainty_record(u)); }, {}, {}, in_json});
    return out;
}

record uncertainty_info(const uncertainty_summary& u) {
    record r;
    r.set("inputs", u.inputs);
    r.set("monte_carlo_samples", u.samples);
    r.set("seed", u.seed);
    r.set("redrawn", u.redrawn);
    r.set("failed", u.failed);
    r.set("coverage", "95 % interval: Monte Carlo 2.5 % and 97.5 % quantiles; linear: value ± 1.96 u");
    return r;
}

const uncertainty_summary* first_uncertain(const std::vector<uncertainty_summary>& u) {
    for (const auto& x : u)
        if (!x.inputs.empty()) return &x;
    return nullptr;
}

std::string uncertainty_line(const std::vector<uncertainty_summary>& u, const char* of) {
    const uncertainty_summary* x = first_uncertain(u);
    if (!x) return "";
    if (x->samples > 0)
        return fmt::format("# ± : Monte Carlo standard uncertainty{}, {} draws, seed {} (inputs: {})\n", of, x->samples,
                           x->seed, fmt::join(x->inputs, ", "));
    return fmt::format("# ± : linear propagation (inputs: {})\n", fmt::join(x->inputs, ", "));
}

}  // namespace tipgap
