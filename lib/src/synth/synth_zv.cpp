// Synthetic constant-current z(V) traces (see tipgap/synth/zv_synth.hpp).
#include <cmath>
#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include "core/detail/parallel.hpp"
#include "synth/detail/normal_source.hpp"
#include "synth/detail/synth_internal.hpp"
#include "tipgap/core/text.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/fit/resonances.hpp"
#include "tipgap/io/atomic_file.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/predict.hpp"
#include "tipgap/synth/zv_synth.hpp"

namespace tipgap {
namespace {

void require(bool ok, const char* key, const std::string& why) {
    if (ok) return;
    location w;
    w.key = key;
    throw_input(w, why);
}

config exact_config(const config& base) {
    config c = base;
    c.model.method = method_kind::exact;
    return c;
}

double gap_at(const config& c, double I, double V) {
    const gap_solution g = solve_gap(c, I, V);
    if (!g.reachable()) {
        throw error(error_kind::no_answer, fmt::format("{:g} A is unreachable at {:g} V: {}", I, V, g.message));
    }
    return g.gap_m;
}

// Maximum of dz/dV near V0: golden-section search (Kiefer 1953) on the central difference of the
// gap with h = 10 mV over V0 +- 0.15 V (a resonance in dz/dV is ~0.5 V wide).
double true_peak(const config& c, double I, double V0) {
    const double h = 0.01;
    auto slope = [&](double V) { return (gap_at(c, I, V + h) - gap_at(c, I, V - h)) / (2.0 * h); };
    const double g = (std::sqrt(5.0) - 1.0) / 2.0;
    double lo = V0 - 0.15, hi = V0 + 0.15;
    double a = hi - g * (hi - lo), b = lo + g * (hi - lo), fa = slope(a), fb = slope(b);
    for (int it = 0; it < 24; ++it) {  // 0.3 V x 0.618^24 ~ 3e-6 V
        if (fa > fb) {
            hi = b, b = a, fb = fa, a = hi - g * (hi - lo), fa = slope(a);
        } else {
            lo = a, a = b, fa = fb, b = lo + g * (hi - lo), fb = slope(b);
        }
    }
    return 0.5 * (lo + hi);
}

}  // namespace

void zv_synth_options::validate(const model_options& m) const {
    require(std::isfinite(current_A) && current_A > 0, "current_A", "expected a setpoint current > 0");
    require(std::isfinite(bias_from_V) && std::isfinite(bias_to_V) && bias_from_V != 0 && bias_to_V != 0 &&
                (bias_from_V > 0) == (bias_to_V > 0) && bias_from_V != bias_to_V,
            "bias", "expected a range FROM..TO of one sign, FROM != TO, without 0");
    require(std::abs(bias_from_V) <= m.bias_limit_V && std::abs(bias_to_V) <= m.bias_limit_V, "bias",
            fmt::format("|bias| must not exceed the configured bias_limit of {:g} V", m.bias_limit_V));
    require(points >= 8 && points <= 100000, "points", "expected 8 to 100000 points");
    require(std::isfinite(z_noise_m) && z_noise_m >= 0 && z_noise_m <= 1e-9, "z_noise_m", "expected a z noise in [0, 1] nm");
    require(std::isfinite(z_at_first_m), "z_at_first_m", "expected a finite z");
}

zv_synth_trace synthesise_zv_trace(const config& base, const zv_synth_options& o) {
    o.validate(base.model);
    const config c = exact_config(base);
    zv_synth_trace t;
    t.sample_work_function_J = c.model.sample.work_function_J;
    const std::size_t n = o.points;
    t.bias_V.resize(n);
    t.gap_m.resize(n);
    for (std::size_t k = 0; k < n; ++k) {
        t.bias_V[k] = o.bias_from_V + (o.bias_to_V - o.bias_from_V) * static_cast<double>(k) / static_cast<double>(n - 1);
    }
    detail::parallel_for(n, 0, [&](std::size_t k) { t.gap_m[k] = gap_at(c, o.current_A, t.bias_V[k]); });
    t.gap_at_z0_m = t.gap_m.front() - o.z_at_first_m;
    detail::normal_source noise(o.seed);
    t.z_m.resize(n);
    for (std::size_t k = 0; k < n; ++k) t.z_m[k] = t.gap_m[k] - t.gap_at_z0_m + o.z_noise_m * noise.next();
    // Resonances located on the noise-free trace, then polished on the model itself.
    bias_trace clean;
    clean.kind = trace_kind::zv;
    clean.bias_V = t.bias_V;
    clean.signal = t.gap_m;
    for (const resonance_peak& p : find_resonance_peaks(clean.kind, clean.bias_V, clean.signal, {})) {
        t.peaks_V.push_back(true_peak(c, o.current_A, p.bias_V));
    }
    return t;
}

void write_zv_trace(const zv_synth_trace& t, const config& c, const zv_synth_options& o, const std::string& csv_path,
                    const std::string& truth_path, const std::string& command_line) {
    const double eV = si::electron_volt;
    std::string csv = "# synthetic: constant-current z(V) trace from tipgap's exact-transmission model, not a measurement\n";
    if (!command_line.empty()) csv += fmt::format("# generator: {}\n", single_line(command_line));
    csv += fmt::format("# current: {:g} nA\n# temperature: {:g} K\n# z_noise: {:g} nm\n# seed: {}\n", o.current_A * 1e9,
                       c.model.temperature_K, o.z_noise_m * 1e9, o.seed);
    csv += "bias [V],z [nm]\n";
    for (std::size_t k = 0; k < t.bias_V.size(); ++k) csv += fmt::format("{:.6g},{:.7f}\n", t.bias_V[k], t.z_m[k] * 1e9);
    std::string y = "# Ground truth of a synthetic z(V) trace (tipgap synth --zv); not a measurement.\n";
    if (!command_line.empty()) y += fmt::format("generator: \"{}\"\n", command_line);
    y += fmt::format("trace: \"{}\"\nsynthetic: true\n", csv_path);
    y += fmt::format("tip_work_function_eV: {:.9g}\ntip_fermi_energy_eV: {:.9g}\n", c.model.tip.work_function_J / eV,
                     c.model.tip.fermi_energy_J / eV);
    y += fmt::format("sample_work_function_eV: {:.9g}\nsample_fermi_energy_eV: {:.9g}\n", t.sample_work_function_J / eV,
                     c.model.sample.fermi_energy_J / eV);
    y += fmt::format("current_A: {:.9g}\ntemperature_K: {:g}\ngap_at_z0_nm: {:.9g}\nz_noise_nm: {:g}\nseed: {}\n",
                     o.current_A, c.model.temperature_K, t.gap_at_z0_m * 1e9, o.z_noise_m * 1e9, o.seed);
    y += "peaks_V: [";
    for (std::size_t k = 0; k < t.peaks_V.size(); ++k) y += fmt::format("{}{:.6f}", k ? ", " : "", t.peaks_V[k]);
    y += "]\n";
    write_file_atomically(csv_path, csv);
    write_file_atomically(truth_path, y);
}

zv_truth_record read_zv_truth(const std::string& path) {
    const YAML::Node root = detail::load_truth_yaml(path);
    zv_truth_record t;
    try {
        if (!root["sample_work_function_eV"] || !root["peaks_V"]) throw YAML::Exception(YAML::Mark(), "missing");
        t.sample_work_function_J = root["sample_work_function_eV"].as<double>() * si::electron_volt;
        for (const auto& v : root["peaks_V"]) t.peaks_V.push_back(v.as<double>());
    } catch (const YAML::Exception&) {
        throw_input(location{path, 0, 0, "sample_work_function_eV, peaks_V"}, "expected a number and a list of numbers");
    }
    return t;
}

}  // namespace tipgap
