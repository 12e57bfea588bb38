// tipgap synth: synthetic I(z) curves (or a grid of them) from tipgap's own model plus a documented
// instrument model, with the ground truth written beside each file. Parses flags into
// tipgap::synth_options and calls the library.
#include <chrono>
#include <fmt/format.h>
#include <memory>
#include <string>

#include "command.hpp"
#include "flags.hpp"
#include "output.hpp"
#include "shared_flags.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/synth/synth.hpp"
#include "tipgap/synth/synth_columns.hpp"
#include "tipgap/synth/zv_synth.hpp"

namespace tipgap::cli {
namespace {

struct synth_args {
    std::string out, truth;
    junction_flags junction;
    std::string bias, gap = "0.45nm..1nm", gap_at_z0, sweeps = "retract";
    std::size_t points = 121;
    std::string noise, baseline, gap_jitter, saturation, drift, jump_gap;
    double contact_conductance = 1.0;
    std::uint64_t seed = 1;
    std::string tip_label, sample_label;
    std::string grid, pitch = "1nm", pattern = "disc", disc_radius, disc_centre, disc_wf = "4.3eV";
    std::size_t points_per_curve = 128;
    bool zv = false;  // --zv: a constant-current z(V) trace instead (run_zv); bias empty: 100mV or 4V..10V
    std::string current, z_noise;
};

synth_options synth_opts(const synth_args& a) {
    synth_options o;
    o.bias_V = flag_quantity(a.bias.empty() ? "100mV" : a.bias, dimension::voltage, "--bias");
    const std::size_t dots = a.gap.find("..");
    if (dots == std::string::npos) throw_usage("--gap", fmt::format("expected a range FROM..TO, e.g. 0.45nm..1nm, got '{}'", a.gap));
    o.gap_min_m = flag_quantity(a.gap.substr(0, dots), dimension::length, "--gap");
    o.gap_max_m = flag_quantity(a.gap.substr(dots + 2), dimension::length, "--gap");
    if (!a.gap_at_z0.empty()) o.gap_at_z0_m = flag_quantity(a.gap_at_z0, dimension::length, "--gap-at-z0");
    if (!from_string(a.sweeps, o.sweeps))
        throw_usage("--sweeps", fmt::format("expected {}, got '{}'", accepted_names<synth_sweeps>(), a.sweeps));
    o.points = a.points;
    if (!a.noise.empty()) o.current_noise_A = flag_quantity(a.noise, dimension::current, "--noise");
    if (!a.baseline.empty()) o.baseline_A = flag_quantity(a.baseline, dimension::current, "--baseline");
    if (!a.gap_jitter.empty()) o.gap_jitter_m = flag_quantity(a.gap_jitter, dimension::length, "--gap-jitter");
    if (!a.saturation.empty()) o.saturation_A = flag_quantity(a.saturation, dimension::current, "--saturation");
    if (!a.drift.empty()) o.drift_m = flag_quantity(a.drift, dimension::length, "--drift");
    if (!a.jump_gap.empty()) o.jump_gap_m = flag_quantity(a.jump_gap, dimension::length, "--jump-gap");
    o.contact_conductance_G0 = a.contact_conductance;
    o.seed = a.seed;
    o.tip_label = a.tip_label;
    o.sample_label = a.sample_label;
    return o;
}

synth_grid_options grid_opts(const synth_args& a) {
    synth_grid_options g;
    const std::size_t x = a.grid.find_first_of("xX");
    try {
        if (x == std::string::npos) throw std::invalid_argument("no x");
        std::size_t used = 0;
        g.nx = std::stoul(a.grid.substr(0, x), &used);
        if (used != x) throw std::invalid_argument("junk");
        g.ny = std::stoul(a.grid.substr(x + 1), &used);
        if (used != a.grid.size() - x - 1) throw std::invalid_argument("junk");
    } catch (const std::exception&) {
        throw_usage("--grid", fmt::format("expected NXxNY, e.g. 256x256, got '{}'", a.grid));
    }
    g.pitch_m = flag_quantity(a.pitch, dimension::length, "--pitch");
    if (!from_string(a.pattern, g.pattern)) throw_usage("--pattern", fmt::format("expected {}, got '{}'", accepted_names<grid_pattern>(), a.pattern));
    if (!a.disc_radius.empty()) g.disc_radius_m = flag_quantity(a.disc_radius, dimension::length, "--disc-radius");
    if (!a.disc_centre.empty()) {
        const std::size_t comma = a.disc_centre.find(',');
        if (comma == std::string::npos) throw_usage("--disc-centre", "expected X,Y, e.g. 32nm,32nm");
        g.disc_centre_x_m = flag_quantity(a.disc_centre.substr(0, comma), dimension::length, "--disc-centre");
        g.disc_centre_y_m = flag_quantity(a.disc_centre.substr(comma + 1), dimension::length, "--disc-centre");
    }
    g.disc_work_function_J = flag_quantity(a.disc_wf, dimension::energy, "--disc-work-function");
    naming_flags("synth", flag_error::usage, [&] { g.validate(); });
    return g;
}

// --zv: flags -> tipgap::zv_synth_options -> synthesise_zv_trace -> files.
void run_zv(const config& c, const synth_args& a, const std::string& truth, const std::string& line) {
    zv_synth_options o;
    const std::string bias = a.bias.empty() ? "4V..10V" : a.bias;
    const std::size_t dots = bias.find("..");
    if (dots == std::string::npos) throw_usage("--bias", fmt::format("--zv needs a range FROM..TO, e.g. 4V..10V, got '{}'", bias));
    o.bias_from_V = flag_quantity(bias.substr(0, dots), dimension::voltage, "--bias");
    o.bias_to_V = flag_quantity(bias.substr(dots + 2), dimension::voltage, "--bias");
    if (!a.current.empty()) o.current_A = flag_quantity(a.current, dimension::current, "--current");
    if (!a.z_noise.empty()) o.z_noise_m = flag_quantity(a.z_noise, dimension::length, "--z-noise");
    o.points = a.points;
    o.seed = a.seed;
    naming_flags("synth", flag_error::usage, [&] { o.validate(c.model); });
    const zv_synth_trace t = synthesise_zv_trace(c, o);
    write_zv_trace(t, c, o, a.out, truth, line);
    fmt::print("wrote {} ({} points, synthetic z(V) at {:g} nA) and {}\n", a.out, t.bias_V.size(), o.current_A * 1e9, truth);
    fmt::print("{}", zv_trace_summary(t));
}

void run(const synth_args& a, const std::string& line) {
    const config c = load_junction(a.junction);
    if (a.zv) {
        return run_zv(c, a, a.truth.empty() ? truth_path_for(a.out) : a.truth, line);
    }
    synth_options o = synth_opts(a);
    if (!a.grid.empty()) o.points = a.points_per_curve;
    naming_flags("synth", flag_error::usage, [&] { o.validate(c.model); });  // before any file is written
    const std::string truth = a.truth.empty() ? truth_path_for(a.out) : a.truth;
    if (a.grid.empty()) {
        const synth_curve curve = synthesise_curve(c, o);
        write_synth_curve(curve, c, o, a.out, truth, line);
        fmt::print("wrote {} ({} rows, synthetic) and {}\n", a.out, curve.samples.size(), truth);
        fmt::print("{}", synth_curve_summary(curve, o));
        return;
    }
    const synth_grid_options g = grid_opts(a);
    const auto t0 = std::chrono::steady_clock::now();
    const synth_grid_truth t = naming_flags("synth", flag_error::usage, [&] { return write_synth_grid(c, o, g, a.out, truth, line); });
    const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    fmt::print("wrote {} ({}x{} pixels, {} rows, synthetic) and {} in {:.2f} s\n", a.out, g.nx, g.ny, t.rows, truth, seconds);
    fmt::print("{}", synth_grid_summary(t));
}

}  // namespace

command synth_command() {
    auto a = std::make_shared<synth_args>();
    command cmd{"synth", "Write a synthetic I(z) curve (or a grid of curves) from tipgap's model plus instrument noise, with "
                         "its ground truth beside it"};
    cmd.flags = {
        {"--out", "Curve CSV to write (the truth goes to <stem>.truth.yaml beside it)", &a->out, "FILE", true},
        {"--truth", "Ground-truth YAML to write (default <stem>.truth.yaml)", &a->truth, "FILE"},
        {"--bias", "Sample bias (default 100mV)", &a->bias, "VOLTAGE"},
        {"--gap", "Absolute gap range FROM..TO (default 0.45nm..1nm)", &a->gap, "RANGE"},
        {"--points", "Samples per sweep (default 121)", &a->points, "N"},
        {"--gap-at-z0", "Absolute gap at z = 0 (default: the closest gap)", &a->gap_at_z0, "LENGTH"},
        {"--sweeps", "retract, approach or approach_retract (default retract)", &a->sweeps, "KIND"},
        {"--noise", "Standard deviation of the white current noise, e.g. 1pA (default 0)", &a->noise, "CURRENT"},
        {"--baseline", "Additive current offset of the noise floor, e.g. 0.5pA (default 0)", &a->baseline, "CURRENT"},
        {"--gap-jitter", "Gaussian jitter of the gap at each point, e.g. 2pm: noise proportional to the current (default 0)",
         &a->gap_jitter, "LENGTH"},
        {"--saturation", "Amplifier clip level, e.g. 3nA (default: none)", &a->saturation, "CURRENT"},
        {"--drift", "Piezo drift over the whole file (gap error linear in time), e.g. 0.02nm", &a->drift, "LENGTH"},
        {"--jump-gap", "Jump to contact below this true gap, e.g. 0.3nm (default: none)", &a->jump_gap, "LENGTH"},
        {"--contact-conductance", "Conductance after the jump in G0 (default 1)", &a->contact_conductance, "G0"},
        {"--seed", "Seed of the std::mt19937_64 noise generator (default 1)", &a->seed, "N"},
        {"--tip-label", "Text for the '# tip:' metadata", &a->tip_label, "TEXT"},
        {"--sample-label", "Text for the '# sample:' metadata", &a->sample_label, "TEXT"},
        {"--grid", "Grid mode: NXxNY pixels, one retract curve each, in one long CSV", &a->grid, "NXxNY"},
        {"--pitch", "Grid pixel spacing (default 1nm)", &a->pitch, "LENGTH"},
        {"--points-per-curve", "Grid mode: samples per pixel (default 128)", &a->points_per_curve, "N"},
        {"--pattern", "Grid pattern: uniform or disc (default disc)", &a->pattern, "KIND"},
        {"--disc-radius", "Disc radius (default a quarter of the shorter side)", &a->disc_radius, "LENGTH"},
        {"--disc-centre", "Disc centre X,Y (default the grid centre)", &a->disc_centre, "X,Y"},
        {"--disc-work-function", "Sample work function inside the disc (default 4.3eV)", &a->disc_wf, "ENERGY"},
        {"--zv", "Write a constant-current z(V) trace (exact model, with its resonances) instead: --bias FROM..TO "
                 "(default 4V..10V), --current, --z-noise, --points, --seed", &a->zv},
        {"--current", "--zv: setpoint current (default 1nA)", &a->current, "CURRENT"},
        {"--z-noise", "--zv: standard deviation of white z noise, e.g. 2pm (default 0)", &a->z_noise, "LENGTH"},
    };
    const auto junction = junction_flag_list(a->junction);
    cmd.flags.insert(cmd.flags.end(), junction.begin(), junction.end());
    cmd.run = [a](const std::string& line) { run(*a, line); };
    return cmd;
}

}  // namespace tipgap::cli
