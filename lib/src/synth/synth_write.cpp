// Writing a synthetic curve (CSV in the reader's format) and its ground truth (YAML), and reading
// the truth back.
#include <charconv>
#include <cmath>
#include <filesystem>
#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include "io/detail/read_capped.hpp"
#include "synth/detail/synth_internal.hpp"
#include "tipgap/core/text.hpp"
#include "tipgap/io/atomic_file.hpp"
#include "tipgap/core/constants.hpp"

namespace tipgap {
namespace detail {

std::string yaml_quote(const std::string& s) {
    std::string out = "\"";
    for (char ch : s) {
        if (ch == '"' || ch == '\\') out += '\\';
        if (ch == '\n') {
            out += "\\n";
            continue;
        }
        out += ch;
    }
    return out + "\"";
}

void append_number(std::string& out, double v, int significant) {
    char buf[64];
    // Seven significant digits resolve 1e-7 of a current, far below any noise here, and keep the
    // files independent of last-bit differences between maths libraries.
    auto r = std::to_chars(buf, buf + sizeof buf, v, std::chars_format::general, significant);
    out.append(buf, r.ptr);
}

}  // namespace detail

namespace {

constexpr double pA = 1e-12;

std::string num(double v) { return std::isfinite(v) ? fmt::format("{:.9g}", v) : std::string("null"); }

std::string electrode_label(const electrode& e) {
    return fmt::format("{} ({:.3g} eV)", e.material.empty() ? "metal" : e.material, e.work_function_J / si::electron_volt);
}

void append_model_yaml(std::string& y, const config& c) {
    const double eV = si::electron_volt;
    y += "model:\n";
    y += fmt::format("  config: {}\n", detail::yaml_quote(c.source));
    y += fmt::format("  tip_material: {}\n", detail::yaml_quote(c.model.tip.material));
    y += fmt::format("  tip_work_function_eV: {}\n", num(c.model.tip.work_function_J / eV));
    y += fmt::format("  tip_fermi_energy_eV: {}\n", num(c.model.tip.fermi_energy_J / eV));
    y += fmt::format("  sample_material: {}\n", detail::yaml_quote(c.model.sample.material));
    y += fmt::format("  sample_work_function_eV: {}\n", num(c.model.sample.work_function_J / eV));
    y += fmt::format("  sample_fermi_energy_eV: {}\n", num(c.model.sample.fermi_energy_J / eV));
    y += fmt::format("  mean_work_function_eV: {}\n",
                     num(0.5 * (c.model.tip.work_function_J + c.model.sample.work_function_J) / eV));
    y += fmt::format("  image_potential: {}\n", to_string(c.model.image));
    y += fmt::format("  relative_permittivity: {}\n", num(c.model.relative_permittivity));
    y += fmt::format("  temperature_K: {}\n", num(c.model.temperature_K));
    y += fmt::format("  method: {}\n", to_string(c.model.method));
    y += fmt::format("  geometry: {}\n", to_string(c.geometry.kind));
    y += fmt::format("  area_nm2: {}\n", num(c.geometry.area_m2 / 1e-18));
    y += fmt::format("  apex_radius_nm: {}\n", num(c.geometry.apex_radius_m / 1e-9));
    y += fmt::format("  contact_distance_nm: {}\n", num(c.geometry.contact_distance_m / 1e-9));
}

}  // namespace

std::string truth_path_for(const std::string& csv_path) {
    std::filesystem::path p(csv_path);
    return (p.parent_path() / (p.stem().string() + ".truth.yaml")).string();
}

namespace {

// The curve file: '#' metadata lines (synthetic, command, bias, temperature, tip, sample, seed,
// truth file), the header and one row per sample.
std::string synth_curve_csv(const synth_curve& curve, const config& c, const synth_options& o,
                            const std::string& truth_path, const std::string& command_line) {
    const bool pair = o.sweeps == synth_sweeps::approach_retract;
    const std::string truth_name = std::filesystem::path(truth_path).filename().string();
    std::string text;
    text += "# synthetic curve made by tipgap synth from its own model: not a measurement\n";
    if (!command_line.empty()) text += "# command: " + single_line(command_line) + "\n";
    text += fmt::format("# bias: {} V\n", num(o.bias_V));
    text += fmt::format("# temperature: {} K\n", num(c.model.temperature_K));
    text += fmt::format("# tip: {}\n", single_line(o.tip_label.empty() ? electrode_label(c.model.tip) : o.tip_label));
    text += fmt::format("# sample: {}\n", single_line(o.sample_label.empty() ? electrode_label(c.model.sample) : o.sample_label));
    text += fmt::format("# seed: {}\n", o.seed);
    text += fmt::format("# truth: {}\n", single_line(truth_name));
    text += pair ? "z [nm],current [pA],direction\n" : "z [nm],current [pA]\n";
    char buf[64];
    for (const synth_sample& p : curve.samples) {
        // z to 1 fm (6 decimals in nm), far below piezo resolution.
        auto r = std::to_chars(buf, buf + sizeof buf, p.z_m / 1e-9 + 0.0, std::chars_format::fixed, 6);
        text.append(buf, r.ptr);
        text += ',';
        detail::append_number(text, p.current_A / pA);
        if (pair) {
            text += ',';
            text += to_string(p.direction);
        }
        text += '\n';
    }
    return text;
}

}  // namespace

void write_synth_curve(const synth_curve& curve, const config& c, const synth_options& o, const std::string& csv_path,
                       const std::string& truth_path, const std::string& command_line) {
    const synth_truth& t = curve.truth;
    const std::string text = synth_curve_csv(curve, c, o, truth_path, command_line);
    const double eV = si::electron_volt;
    std::string y;
    y += "# Ground truth of a synthetic curve made by tipgap synth (not a measurement).\n";
    y += "# Signal chain and the meaning of every entry: tipgap/synth.hpp and demo_scans/README.md.\n";
    y += fmt::format("file: {}\n", detail::yaml_quote(std::filesystem::path(csv_path).filename().string()));
    y += "synthetic: true\n";
    y += fmt::format("command: {}\n", detail::yaml_quote(command_line));
    y += fmt::format("seed: {}\n", o.seed);
    y += fmt::format("bias_V: {}\n", num(o.bias_V));
    append_model_yaml(y, c);
    y += "schedule:\n";
    y += fmt::format("  sweeps: {}\n", to_string(o.sweeps));
    y += fmt::format("  points_per_sweep: {}\n", o.points);
    y += fmt::format("  gap_min_nm: {}\n", num(o.gap_min_m / 1e-9));
    y += fmt::format("  gap_max_nm: {}\n", num(o.gap_max_m / 1e-9));
    y += fmt::format("  gap_at_z0_nm: {}\n", num(t.gap_at_z0_m / 1e-9));
    y += "instrument:\n";
    y += fmt::format("  current_noise_pA: {}\n", num(o.current_noise_A / pA));
    y += fmt::format("  baseline_pA: {}\n", num(o.baseline_A / pA));
    // Written only when used, so that files made before the option read the same.
    if (o.gap_jitter_m > 0.0) y += fmt::format("  gap_jitter_pm: {}\n", num(o.gap_jitter_m / 1e-12));
    y += fmt::format("  noise_floor_pA: {}\n", num(t.noise_floor_A / pA));
    y += fmt::format("  saturation_pA: {}\n", num(o.saturation_A / pA));
    y += fmt::format("  drift_nm: {}\n", num(o.drift_m / 1e-9));
    y += fmt::format("  jump_gap_nm: {}\n", num(o.jump_gap_m / 1e-9));
    y += fmt::format("  jump_z_nm: {}\n", num(t.jump_z_m / 1e-9));
    y += fmt::format("  contact_conductance_G0: {}\n", num(o.contact_conductance_G0));
    y += "model_truth:\n";
    y += fmt::format("  decay_constant_range_per_nm: {}\n", num(t.decay_constant_range_per_m * 1e-9));
    y += fmt::format("  apparent_barrier_range_eV: {}\n", num(t.apparent_barrier_range_J / eV));
    y += fmt::format("  decay_constant_at_gap_min_per_nm: {}\n", num(t.decay_constant_at_gap_min_per_m * 1e-9));
    y += fmt::format("  decay_constant_at_gap_max_per_nm: {}\n", num(t.decay_constant_at_gap_max_per_m * 1e-9));
    y += fmt::format("  apparent_barrier_at_gap_min_eV: {}\n", num(t.apparent_barrier_at_gap_min_J / eV));
    y += fmt::format("  apparent_barrier_at_gap_max_eV: {}\n", num(t.apparent_barrier_at_gap_max_J / eV));
    y += fmt::format("  current_at_gap_min_pA: {}\n", num(t.current_at_gap_min_A / pA));
    y += fmt::format("  current_at_gap_max_pA: {}\n", num(t.current_at_gap_max_A / pA));
    y += "  note: \"the image potential makes the apparent barrier lower than the mean work function\"\n";
    y += "sweeps:\n";
    for (const synth_sweep_truth& s : t.sweeps) {
        y += fmt::format("  - direction: {}\n", to_string(s.direction));
        y += fmt::format("    first_row: {}\n", s.first_row + 1);
        y += fmt::format("    rows: {}\n", s.rows);
        y += fmt::format("    usable_points: {}\n", s.usable_points);
        y += fmt::format("    decay_constant_expected_per_nm: {}\n", num(s.decay_constant_expected_per_m * 1e-9));
        y += fmt::format("    apparent_barrier_expected_eV: {}\n", num(s.apparent_barrier_expected_J / eV));
        y += fmt::format("    decay_constant_model_per_nm: {}\n", num(s.decay_constant_model_per_m * 1e-9));
        y += fmt::format("    apparent_barrier_model_eV: {}\n", num(s.apparent_barrier_model_J / eV));
    }

    // Truth first: a curve file never exists without its truth.
    write_file_atomically(truth_path, y);
    write_file_atomically(csv_path, text);
}

namespace detail {

YAML::Node load_truth_yaml(const std::string& path) {
    const std::string text = read_capped(path, config_cap_bytes, false, "a truth file");
    try {
        return YAML::Load(text);
    } catch (const YAML::Exception& e) {
        throw_input(location{path, e.mark.line + 1, e.mark.column + 1, ""}, e.msg);
    }
}

}  // namespace detail

truth_record read_truth(const std::string& path) {
    const YAML::Node root = detail::load_truth_yaml(path);
    auto get = [&](const YAML::Node& parent, const char* parent_key, const char* key) -> double {
        const YAML::Node n = parent[key];
        const std::string full = parent_key[0] ? fmt::format("{}.{}", parent_key, key) : std::string(key);
        if (!n) throw_input(location{path, 0, 0, full}, "missing in the truth file");
        if (n.IsNull()) return std::nan("");
        try {
            return n.as<double>();
        } catch (const YAML::Exception&) {
            throw_input(location{path, n.Mark().line + 1, n.Mark().column + 1, full}, "expected a number");
        }
    };
    truth_record t;
    t.file = root["file"] ? root["file"].as<std::string>() : std::string();
    t.seed = root["seed"] ? root["seed"].as<std::uint64_t>() : 0;
    t.bias_V = get(root, "", "bias_V");
    const YAML::Node inst = root["instrument"], model = root["model"], sched = root["schedule"];
    if (!inst || !model || !sched) throw_input(location{path, 0, 0, ""}, "expected model, schedule and instrument blocks");
    t.current_noise_A = get(inst, "instrument", "current_noise_pA") * pA;
    t.baseline_A = get(inst, "instrument", "baseline_pA") * pA;
    t.saturation_A = get(inst, "instrument", "saturation_pA") * pA;
    t.drift_m = get(inst, "instrument", "drift_nm") * 1e-9;
    t.jump_gap_m = get(inst, "instrument", "jump_gap_nm") * 1e-9;
    t.jump_z_m = get(inst, "instrument", "jump_z_nm") * 1e-9;
    t.mean_work_function_J = get(model, "model", "mean_work_function_eV") * si::electron_volt;
    t.gap_at_z0_m = get(sched, "schedule", "gap_at_z0_nm") * 1e-9;
    const YAML::Node sweeps = root["sweeps"];
    if (!sweeps || !sweeps.IsSequence()) throw_input(location{path, 0, 0, "sweeps"}, "expected a list of sweeps");
    for (const YAML::Node& s : sweeps) {
        synth_sweep_truth st;
        const std::string d = s["direction"] ? s["direction"].as<std::string>() : std::string();
        if (!from_string(d, st.direction))
            throw_input(location{path, s.Mark().line + 1, 0, "sweeps.direction"}, "expected " + accepted_names<sweep_direction>());
        st.first_row = static_cast<std::size_t>(get(s, "sweeps", "first_row")) - 1;
        st.rows = static_cast<std::size_t>(get(s, "sweeps", "rows"));
        st.usable_points = static_cast<std::size_t>(get(s, "sweeps", "usable_points"));
        st.decay_constant_expected_per_m = get(s, "sweeps", "decay_constant_expected_per_nm") * 1e9;
        st.decay_constant_model_per_m = get(s, "sweeps", "decay_constant_model_per_nm") * 1e9;
        st.apparent_barrier_expected_J = get(s, "sweeps", "apparent_barrier_expected_eV") * si::electron_volt;
        st.apparent_barrier_model_J = get(s, "sweeps", "apparent_barrier_model_eV") * si::electron_volt;
        t.sweeps.push_back(st);
    }
    return t;
}

}  // namespace tipgap
