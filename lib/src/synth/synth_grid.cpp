// Streaming a synthetic grid of curves (one long CSV) with a known work-function pattern.
#include <algorithm>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <fmt/format.h>

#include "synth/detail/normal_source.hpp"
#include "synth/detail/synth_internal.hpp"
#include "tipgap/core/text.hpp"
#include "tipgap/io/atomic_file.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/model/geometry.hpp"

namespace tipgap {

void synth_grid_options::validate() const {
    auto bad = [](const char* key, const std::string& what) { throw_input(location{"", 0, 0, key}, what); };
    if (nx < 1 || nx > 4096 || ny < 1 || ny > 4096) bad("grid", "each side must be 1 to 4096 pixels");
    if (!(pitch_m > 0.0 && std::isfinite(pitch_m))) bad("pitch_m", "must be > 0");
    if (!std::isnan(disc_radius_m) && !(disc_radius_m > 0.0 && std::isfinite(disc_radius_m)))
        bad("disc_radius_m", "must be > 0");
    if (!(disc_work_function_J > 0.0 && disc_work_function_J <= 20.0 * si::electron_volt))
        bad("disc_work_function_J", "must be in (0, 20 eV]");
}

namespace {

constexpr double pA = 1e-12;
// Flush the text buffer to the file at this size: constant memory, few system calls.
constexpr std::size_t flush_bytes = 1u << 20;

struct region_shape {
    grid_region_truth truth;
    std::vector<double> current_A;  // noise-free, contact applied, per sample
};

region_shape make_region(const config& c, const synth_options& o, const std::vector<double>& gaps, const char* name) {
    region_shape r;
    r.truth.name = name;
    r.truth.sample_work_function_J = c.model.sample.work_function_J;
    r.truth.mean_work_function_J = 0.5 * (c.model.tip.work_function_J + c.model.sample.work_function_J);
    synth_truth t;
    detail::model_range_truth(c, o, t);
    r.truth.decay_constant_range_per_m = t.decay_constant_range_per_m;
    r.truth.apparent_barrier_range_J = t.apparent_barrier_range_J;
    const double plateau_A = o.contact_conductance_G0 * si::conductance_quantum * o.bias_V;
    std::vector<double> model(gaps.size());
    std::vector<bool> use(gaps.size());
    r.current_A.resize(gaps.size());
    for (std::size_t k = 0; k < gaps.size(); ++k) {
        const double im = total_current(c.model, c.geometry, gaps[k], o.bias_V);
        const bool contact = o.jump_gap_m > 0.0 && gaps[k] < o.jump_gap_m;
        r.current_A[k] = contact ? plateau_A : im;
        model[k] = im + o.baseline_A;  // as recorded without noise (see synth_sweep_truth)
        use[k] = !contact && detail::usable_current(std::abs(model[k]), o);
    }
    r.truth.decay_constant_expected_per_m = detail::expected_decay(gaps, model, use);
    r.truth.apparent_barrier_expected_J = apparent_barrier_from_decay(r.truth.decay_constant_expected_per_m);
    return r;
}

void append_fixed(std::string& out, double v, int decimals) {
    char buf[64];
    auto r = std::to_chars(buf, buf + sizeof buf, v + 0.0, std::chars_format::fixed, decimals);
    out.append(buf, r.ptr);
}

}  // namespace

namespace {

// Disc placement (defaults: centred, a quarter of the shorter side) and the expected noise floor.
synth_grid_truth grid_layout(const synth_options& o, const synth_grid_options& g) {
    synth_grid_truth truth;
    const double width = static_cast<double>(g.nx - 1) * g.pitch_m, height = static_cast<double>(g.ny - 1) * g.pitch_m;
    truth.disc_centre_x_m = std::isnan(g.disc_centre_x_m) ? 0.5 * width : g.disc_centre_x_m;
    truth.disc_centre_y_m = std::isnan(g.disc_centre_y_m) ? 0.5 * height : g.disc_centre_y_m;
    truth.disc_radius_m = std::isnan(g.disc_radius_m)
                              ? 0.25 * static_cast<double>(std::min(g.nx, g.ny)) * g.pitch_m
                              : g.disc_radius_m;
    truth.noise_floor_A = std::abs(o.baseline_A) + 3.0 * o.current_noise_A;
    return truth;
}

// The "# key: value" lines and the column header of the grid CSV.
std::string grid_header(const config& c, const synth_options& o, const synth_grid_options& g,
                        const std::string& truth_path, const std::string& command_line) {
    std::string buf;
    buf += "# synthetic grid made by tipgap synth from its own model: not a measurement\n";
    if (!command_line.empty()) buf += "# command: " + single_line(command_line) + "\n";
    buf += fmt::format("# bias: {:.9g} V\n", o.bias_V);
    buf += fmt::format("# temperature: {:.9g} K\n", c.model.temperature_K);
    buf += fmt::format("# grid: {}x{}\n", g.nx, g.ny);
    buf += fmt::format("# pitch: {:.9g} nm\n", g.pitch_m / 1e-9);
    buf += fmt::format("# points_per_curve: {}\n", o.points);
    buf += fmt::format("# pattern: {}\n", to_string(g.pattern));
    buf += fmt::format("# seed: {}\n", o.seed);
    buf += fmt::format("# truth: {}\n", single_line(std::filesystem::path(truth_path).filename().string()));
    buf += "x [nm],y [nm],z [nm],current [pA]\n";
    return buf;
}

// Streams every pixel's rows (row-major, x fastest) after the text already in `buf`, drawing the
// noise in that order; counts pixels per region and rows in `truth`.
void write_grid_rows(atomic_output& file, std::string& buf, const synth_options& o, const synth_grid_options& g,
                     const std::vector<std::string>& z_text, std::vector<region_shape>& regions,
                     synth_grid_truth& truth) {
    detail::normal_source noise(o.seed);
    std::string prefix;
    for (std::size_t iy = 0; iy < g.ny; ++iy) {
        for (std::size_t ix = 0; ix < g.nx; ++ix) {
            const double x = static_cast<double>(ix) * g.pitch_m, y = static_cast<double>(iy) * g.pitch_m;
            std::size_t region = 0;
            if (g.pattern == grid_pattern::disc &&
                std::hypot(x - truth.disc_centre_x_m, y - truth.disc_centre_y_m) <= truth.disc_radius_m)
                region = 1;
            ++regions[region].truth.pixels;
            prefix.clear();
            detail::append_number(prefix, x / 1e-9 + 0.0);
            prefix += ',';
            detail::append_number(prefix, y / 1e-9 + 0.0);
            prefix += ',';
            const std::vector<double>& shape = regions[region].current_A;
            for (std::size_t k = 0; k < z_text.size(); ++k) {
                double i = shape[k] + o.baseline_A + o.current_noise_A * noise.next();
                if (o.saturation_A > 0.0) i = std::clamp(i, -o.saturation_A, o.saturation_A);
                buf += prefix;
                buf += z_text[k];
                buf += ',';
                // Six significant digits: 1e-6 of the current, below the model's own accuracy.
                detail::append_number(buf, i / pA, 6);
                buf += '\n';
            }
            truth.rows += z_text.size();
            if (buf.size() >= flush_bytes) {
                file.stream().write(buf.data(), static_cast<std::streamsize>(buf.size()));
                buf.clear();
            }
        }
    }
    file.stream().write(buf.data(), static_cast<std::streamsize>(buf.size()));
}

// The truth file's pattern and regions blocks.
std::string grid_regions_yaml(const synth_grid_options& g, const synth_grid_truth& truth) {
    const double eV = si::electron_volt;
    std::string yml;
    yml += "pattern:\n";
    yml += fmt::format("  kind: {}\n", to_string(g.pattern));
    if (g.pattern == grid_pattern::disc) {
        yml += fmt::format("  disc_centre_x_nm: {:.9g}\n", truth.disc_centre_x_m / 1e-9);
        yml += fmt::format("  disc_centre_y_nm: {:.9g}\n", truth.disc_centre_y_m / 1e-9);
        yml += fmt::format("  disc_radius_nm: {:.9g}\n", truth.disc_radius_m / 1e-9);
        yml += "  inside: \"pixels with hypot(x - cx, y - cy) <= radius\"\n";
    }
    yml += "regions:\n";
    for (const grid_region_truth& r : truth.regions) {
        yml += fmt::format("  - name: {}\n", r.name);
        yml += fmt::format("    pixels: {}\n", r.pixels);
        yml += fmt::format("    sample_work_function_eV: {:.9g}\n", r.sample_work_function_J / eV);
        yml += fmt::format("    mean_work_function_eV: {:.9g}\n", r.mean_work_function_J / eV);
        yml += fmt::format("    decay_constant_range_per_nm: {:.9g}\n", r.decay_constant_range_per_m * 1e-9);
        yml += fmt::format("    apparent_barrier_range_eV: {:.9g}\n", r.apparent_barrier_range_J / eV);
        yml += fmt::format("    decay_constant_expected_per_nm: {:.9g}\n", r.decay_constant_expected_per_m * 1e-9);
        yml += fmt::format("    apparent_barrier_expected_eV: {:.9g}\n", r.apparent_barrier_expected_J / eV);
    }
    return yml;
}

// The whole truth file (YAML) of a written grid.
std::string grid_truth_yaml(const config& c, const synth_options& o, const synth_grid_options& g,
                            const synth_grid_truth& truth, double gap0, const std::string& csv_path,
                            const std::string& command_line) {
    const double eV = si::electron_volt;
    std::string yml;
    yml += "# Ground truth of a synthetic grid made by tipgap synth (not a measurement).\n";
    yml += fmt::format("file: {}\n", detail::yaml_quote(std::filesystem::path(csv_path).filename().string()));
    yml += "synthetic: true\n";
    yml += fmt::format("command: {}\n", detail::yaml_quote(command_line));
    yml += fmt::format("seed: {}\n", o.seed);
    yml += fmt::format("bias_V: {:.9g}\n", o.bias_V);
    yml += fmt::format("grid: {{nx: {}, ny: {}, pitch_nm: {:.9g}, points_per_curve: {}, rows: {}}}\n", g.nx, g.ny,
                       g.pitch_m / 1e-9, o.points, truth.rows);
    yml += fmt::format("schedule: {{gap_min_nm: {:.9g}, gap_max_nm: {:.9g}, gap_at_z0_nm: {:.9g}}}\n", o.gap_min_m / 1e-9,
                       o.gap_max_m / 1e-9, gap0 / 1e-9);
    yml += fmt::format(
        "instrument: {{current_noise_pA: {:.9g}, baseline_pA: {:.9g}, noise_floor_pA: {:.9g}, saturation_pA: {:.9g}, "
        "jump_gap_nm: {:.9g}, contact_conductance_G0: {:.9g}}}\n",
        o.current_noise_A / pA, o.baseline_A / pA, truth.noise_floor_A / pA, o.saturation_A / pA, o.jump_gap_m / 1e-9,
        o.contact_conductance_G0);
    yml += fmt::format("model: {{config: {}, tip_work_function_eV: {:.9g}, image_potential: {}, temperature_K: {:.9g}, "
                       "geometry: {}}}\n",
                       detail::yaml_quote(c.source), c.model.tip.work_function_J / eV, to_string(c.model.image),
                       c.model.temperature_K, to_string(c.geometry.kind));
    return yml + grid_regions_yaml(g, truth);
}

}  // namespace

synth_grid_truth write_synth_grid(const config& c, const synth_options& o, const synth_grid_options& g,
                                  const std::string& csv_path, const std::string& truth_path,
                                  const std::string& command_line) {
    o.validate(c.model);
    g.validate();
    if (o.drift_m != 0.0) throw_input(location{"", 0, 0, "drift_m"}, "piezo drift is not supported in grid mode");
    if (o.sweeps != synth_sweeps::retract)
        throw_input(location{"", 0, 0, "sweeps"}, "grid mode writes one retract sweep per pixel");

    synth_grid_truth truth = grid_layout(o, g);
    const double gap0 = std::isnan(o.gap_at_z0_m) ? o.gap_min_m : o.gap_at_z0_m;
    const std::size_t n = o.points;
    std::vector<double> gaps(n);
    std::vector<std::string> z_text(n);
    for (std::size_t k = 0; k < n; ++k) {
        gaps[k] = o.gap_min_m + (o.gap_max_m - o.gap_min_m) * static_cast<double>(k) / static_cast<double>(n - 1);
        // 0.1 pm resolution in z: far below piezo noise, and keeps a 256x256x128 grid near 200 MB.
        append_fixed(z_text[k], (gaps[k] - gap0) / 1e-9, 4);
    }
    // The model once per region: the shape depends only on the region's work function.
    std::vector<region_shape> regions;
    regions.push_back(make_region(c, o, gaps, "background"));
    if (g.pattern == grid_pattern::disc) {
        const config disc = detail::with_work_functions(c, c.model.tip.work_function_J, g.disc_work_function_J);
        regions.push_back(make_region(disc, o, gaps, "disc"));
    }

    atomic_output file(csv_path);
    std::string buf;
    buf.reserve(flush_bytes + 4096);
    buf += grid_header(c, o, g, truth_path, command_line);
    write_grid_rows(file, buf, o, g, z_text, regions, truth);
    for (const region_shape& r : regions) truth.regions.push_back(r.truth);
    write_file_atomically(truth_path, grid_truth_yaml(c, o, g, truth, gap0, csv_path, command_line));
    file.commit();
    return truth;
}

}  // namespace tipgap
