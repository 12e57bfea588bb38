// tipgap demo, resonance section: formatting only (the analysis is lib/src/demo/demo.cpp).
#include "demo_resonances.hpp"

#include <fmt/format.h>

#include "output.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/figures/resonance_plot.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap::cli {
namespace {
constexpr double eV = si::electron_volt;

std::string peak_list(const std::vector<double>& v) {
    std::string s;
    for (double x : v) s += fmt::format("{}{:.3f}", s.empty() ? "" : " ", x);
    return s.empty() ? "-" : s;
}
}  // namespace

std::string resonance_plot_name(const demo_resonance& d) {
    return fmt::format("resonance-{}.png", std::filesystem::path(d.trace->file).stem().string());
}

std::string resonance_summary(const demo_report& r) {
    if (r.resonances.empty()) return "";
    text_table t;
    t.headers = {"file", "peaks [V]", "truth peaks [V]", "W fit [eV]", "W formula [eV]", "truth W [eV]", "W in 95% CI"};
    for (const demo_resonance& d : r.resonances) {
        std::vector<double> found;
        for (const auto& p : d.result.peaks) found.push_back(p.bias_V);
        t.rows.push_back({std::filesystem::path(d.trace->file).filename().string(), peak_list(found),
                          d.truth ? peak_list(d.truth->peaks_V) : "-",
                          rounded_pm(d.result.work_function_J / eV, d.result.work_function_stderr_J / eV),
                          rounded(d.result.work_function_formula_J / eV),
                          d.truth ? rounded(d.truth->sample_work_function_J / eV) : "-",
                          d.truth ? (d.work_function_within ? "yes" : "no") : "-"});
    }
    return "\nfield-emission resonances of the synthetic z(V) traces (sample work function from the peaks; the "
           "triangular-well formula ignores the image potential and reads low):\n" +
           t.render();
}

nlohmann::ordered_json resonance_json(const demo_report& r, const std::string& out_dir) {
    nlohmann::ordered_json a = nlohmann::ordered_json::array();
    for (const demo_resonance& d : r.resonances) {
        const resonance_result& x = d.result;
        nlohmann::ordered_json peaks = nlohmann::ordered_json::array();
        for (const auto& p : x.peaks) peaks.push_back({{"order", p.order}, {"bias_V", p.bias_V}, {"bias_stderr_V", p.bias_stderr_V}});
        nlohmann::ordered_json j;
        j["file"] = d.trace->file;
        j["peaks"] = peaks;
        j["work_function_eV"] = x.work_function_J / eV;
        j["work_function_stderr_eV"] = x.work_function_stderr_J / eV;
        j["work_function_ci_eV"] = {x.work_function_ci_low_J / eV, x.work_function_ci_high_J / eV};
        j["work_function_formula_eV"] = x.work_function_formula_J / eV;
        j["status"] = to_string(x.status);
        if (d.truth) {
            j["truth"] = {{"sample_work_function_eV", d.truth->sample_work_function_J / eV}, {"peaks_V", d.truth->peaks_V}};
            j["work_function_within_ci"] = d.work_function_within;
            j["largest_peak_error_V"] = d.largest_peak_error_V;
        }
        j["plot"] = (std::filesystem::path(out_dir) / resonance_plot_name(d)).string();
        a.push_back(j);
    }
    return a;
}

void write_resonance_figures(const demo_report& r, const std::filesystem::path& dir) {
    for (const demo_resonance& d : r.resonances) {
        const std::string title = fmt::format("{}, synthetic", std::filesystem::path(d.trace->file).filename().string());
        plot::write_figure(make_resonance_figure(*d.trace, d.result, title), (dir / resonance_plot_name(d)).string());
    }
}

}  // namespace tipgap::cli
