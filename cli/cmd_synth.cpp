// tipgap synth: synthetic I(z) curves (or a grid of them) from tipgap's own model plus a documented
// instrument model, with the ground truth written beside each file. Parses flags into
// tipgap::synth_options and calls the library.
#include <chrono>
#include <fmt/format.h>
#include <memory>
#include <string>

#include "commands.hpp"
#include "output.hpp"
#include "synth_zv.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/synth/synth.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap::cli {
namespace {

struct synth_args {
    std::string out, truth, config_path;
    std::string tip_material, sample_material, tip_wf, sample_wf, temperature;
    std::string bias = "100mV", gap = "0.45nm..1nm", gap_at_z0, sweeps = "retract";
    std::size_t points = 121;
    std::string noise, baseline, saturation, drift, jump_gap;
    double contact_conductance = 1.0;
    std::uint64_t seed = 1;
    std::string tip_label, sample_label;
    std::string grid, pitch = "1nm", pattern = "disc", disc_radius, disc_centre, disc_wf = "4.3eV";
    std::size_t points_per_curve = 128;
    bool zv = false;                  // --zv: a constant-current z(V) trace instead (synth_zv.cpp)
    std::string current, z_noise;
};

double flag_quantity(const std::string& text, dimension d, const char* flag) {
    try {
        return parse_quantity(text, d, location{});
    } catch (const error& e) {
        throw_usage(flag, e.detail());
    }
}

// The command as parsed, in a canonical order, for the metadata of the files it writes.
std::string command_line(const CLI::App* cmd) {
    std::string s = "tipgap synth";
    for (const CLI::Option* opt : cmd->get_options()) {
        if (opt->count() == 0 || opt->get_name() == "--help") continue;
        for (const std::string& v : opt->results()) {
            const bool quote = v.find_first_of(" \t'\"") != std::string::npos || v.empty();
            s += fmt::format(" {} {}", opt->get_name(), quote ? "'" + v + "'" : v);
        }
    }
    return s;
}

void run(const synth_args& a, const CLI::App* cmd) {
    config c = load_config_or_default(a.config_path);
    if (!a.tip_material.empty()) {
        const material_entry m = find_material(a.tip_material, location{"", 0, 0, "--tip-material"});
        c.model.tip = electrode{m.name, m.work_function_J, m.fermi_energy_J};
    }
    if (!a.sample_material.empty()) {
        const material_entry m = find_material(a.sample_material, location{"", 0, 0, "--sample-material"});
        c.model.sample = electrode{m.name, m.work_function_J, m.fermi_energy_J};
    }
    if (!a.tip_wf.empty()) c.model.tip.work_function_J = flag_quantity(a.tip_wf, dimension::energy, "--tip-work-function");
    if (!a.sample_wf.empty())
        c.model.sample.work_function_J = flag_quantity(a.sample_wf, dimension::energy, "--sample-work-function");
    if (!a.temperature.empty()) c.model.temperature_K = flag_quantity(a.temperature, dimension::temperature, "--temperature");
    c.model.validate();
    if (a.zv) {
        const std::string truth = a.truth.empty() ? truth_path_for(a.out) : a.truth;
        const bool bias_given = cmd->get_option("--bias")->count() > 0;
        run_synth_zv(c, {bias_given ? a.bias : "", a.current, a.z_noise, a.points, a.seed, a.out, truth, command_line(cmd)});
        return;
    }

    synth_options o;
    o.bias_V = flag_quantity(a.bias, dimension::voltage, "--bias");
    const std::size_t dots = a.gap.find("..");
    if (dots == std::string::npos) throw_usage("--gap", fmt::format("expected a range FROM..TO, e.g. 0.45nm..1nm, got '{}'", a.gap));
    o.gap_min_m = flag_quantity(a.gap.substr(0, dots), dimension::length, "--gap");
    o.gap_max_m = flag_quantity(a.gap.substr(dots + 2), dimension::length, "--gap");
    if (!a.gap_at_z0.empty()) o.gap_at_z0_m = flag_quantity(a.gap_at_z0, dimension::length, "--gap-at-z0");
    if (!from_string(a.sweeps, o.sweeps))
        throw_usage("--sweeps", fmt::format("expected retract, approach or approach_retract, got '{}'", a.sweeps));
    o.points = a.points;
    if (!a.noise.empty()) o.current_noise_A = flag_quantity(a.noise, dimension::current, "--noise");
    if (!a.baseline.empty()) o.baseline_A = flag_quantity(a.baseline, dimension::current, "--baseline");
    if (!a.saturation.empty()) o.saturation_A = flag_quantity(a.saturation, dimension::current, "--saturation");
    if (!a.drift.empty()) o.drift_m = flag_quantity(a.drift, dimension::length, "--drift");
    if (!a.jump_gap.empty()) o.jump_gap_m = flag_quantity(a.jump_gap, dimension::length, "--jump-gap");
    o.contact_conductance_G0 = a.contact_conductance;
    o.seed = a.seed;
    o.tip_label = a.tip_label;
    o.sample_label = a.sample_label;
    // Validate here so that errors name the flag, not the options field.
    auto as_flag = [](const error& e) -> std::string {
        static const std::pair<const char*, const char*> flags[] = {
            {"bias_V", "--bias"},           {"gap_min_m", "--gap"},          {"gap_max_m", "--gap"},
            {"points", "--points"},         {"gap_at_z0_m", "--gap-at-z0"},  {"current_noise_A", "--noise"},
            {"baseline_A", "--baseline"},   {"saturation_A", "--saturation"}, {"drift_m", "--drift"},
            {"jump_gap_m", "--jump-gap"},   {"contact_conductance_G0", "--contact-conductance"},
            {"grid", "--grid"},             {"pitch_m", "--pitch"},          {"disc_radius_m", "--disc-radius"},
            {"disc_work_function_J", "--disc-work-function"}, {"sweeps", "--sweeps"}};
        for (const auto& [field, flag] : flags)
            if (e.where().key == field) return flag;
        return e.where().key;
    };
    try {
        synth_options check = o;
        if (!a.grid.empty()) check.points = a.points_per_curve;
        check.validate(c.model);
    } catch (const error& e) {
        throw_usage(as_flag(e), e.detail());
    }
    const std::string truth = a.truth.empty() ? truth_path_for(a.out) : a.truth;
    const std::string line = command_line(cmd);

    if (a.grid.empty()) {
        const synth_curve curve = synthesise_curve(c, o);
        write_synth_curve(curve, c, o, a.out, truth, line);
        const synth_truth& t = curve.truth;
        fmt::print("wrote {} ({} rows, synthetic) and {}\n", a.out, curve.samples.size(), truth);
        fmt::print("model over {:.3g}..{:.3g} nm: kappa {:.4f} 1/nm, phi_ap {:.4f} eV (mean work function {:.4f} eV)\n",
                   o.gap_min_m / 1e-9, o.gap_max_m / 1e-9, t.decay_constant_range_per_m * 1e-9,
                   t.apparent_barrier_range_J / si::electron_volt, t.mean_work_function_J / si::electron_volt);
        for (const synth_sweep_truth& s : t.sweeps) {
            fmt::print("  {}: {} usable points, expected fit kappa {:.4f} 1/nm, phi_ap {:.4f} eV\n", to_string(s.direction),
                       s.usable_points, s.decay_constant_expected_per_m * 1e-9,
                       s.apparent_barrier_expected_J / si::electron_volt);
        }
        return;
    }

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
    if (!from_string(a.pattern, g.pattern)) throw_usage("--pattern", fmt::format("expected uniform or disc, got '{}'", a.pattern));
    if (!a.disc_radius.empty()) g.disc_radius_m = flag_quantity(a.disc_radius, dimension::length, "--disc-radius");
    if (!a.disc_centre.empty()) {
        const std::size_t comma = a.disc_centre.find(',');
        if (comma == std::string::npos) throw_usage("--disc-centre", "expected X,Y, e.g. 32nm,32nm");
        g.disc_centre_x_m = flag_quantity(a.disc_centre.substr(0, comma), dimension::length, "--disc-centre");
        g.disc_centre_y_m = flag_quantity(a.disc_centre.substr(comma + 1), dimension::length, "--disc-centre");
    }
    g.disc_work_function_J = flag_quantity(a.disc_wf, dimension::energy, "--disc-work-function");
    o.points = a.points_per_curve;
    try {
        g.validate();
        if (o.drift_m != 0.0) throw_input(location{"", 0, 0, "drift_m"}, "piezo drift is not supported in grid mode");
        if (o.sweeps != synth_sweeps::retract)
            throw_input(location{"", 0, 0, "sweeps"}, "grid mode writes one retract sweep per pixel");
    } catch (const error& e) {
        throw_usage(as_flag(e), e.detail());
    }
    const auto t0 = std::chrono::steady_clock::now();
    const synth_grid_truth t = write_synth_grid(c, o, g, a.out, truth, line);
    const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    fmt::print("wrote {} ({}x{} pixels, {} rows, synthetic) and {} in {:.2f} s\n", a.out, g.nx, g.ny, t.rows, truth, seconds);
    for (const grid_region_truth& r : t.regions) {
        fmt::print("  {}: {} pixels, sample work function {:.3f} eV, phi_ap {:.4f} eV (kappa {:.4f} 1/nm)\n", r.name,
                   r.pixels, r.sample_work_function_J / si::electron_volt, r.apparent_barrier_expected_J / si::electron_volt,
                   r.decay_constant_expected_per_m * 1e-9);
    }
}

}  // namespace

void add_synth(CLI::App& app) {
    auto a = std::make_shared<synth_args>();
    CLI::App* cmd = app.add_subcommand(
        "synth", "Write a synthetic I(z) curve (or a grid of curves) from tipgap's model plus instrument noise, with its "
                 "ground truth beside it");
    cmd->add_option("--out", a->out, "Curve CSV to write (the truth goes to <stem>.truth.yaml beside it)")
        ->required()
        ->type_name("FILE");
    cmd->add_option("--truth", a->truth, "Ground-truth YAML to write (default <stem>.truth.yaml)")->type_name("FILE");
    cmd->add_option("--config", a->config_path, "Junction config (default: the built-in one)")->type_name("FILE");
    cmd->add_option("--tip-material", a->tip_material, "Tip material from the materials library")->type_name("NAME");
    cmd->add_option("--sample-material", a->sample_material, "Sample material from the materials library")->type_name("NAME");
    cmd->add_option("--tip-work-function", a->tip_wf, "Tip work function, e.g. 3.8eV")->type_name("ENERGY");
    cmd->add_option("--sample-work-function", a->sample_wf, "Sample work function")->type_name("ENERGY");
    cmd->add_option("--temperature", a->temperature, "Temperature, e.g. 4.2K")->type_name("TEMPERATURE");
    cmd->add_option("--bias", a->bias, "Sample bias (default 100mV)")->type_name("VOLTAGE");
    cmd->add_option("--gap", a->gap, "Absolute gap range FROM..TO (default 0.45nm..1nm)")->type_name("RANGE");
    cmd->add_option("--points", a->points, "Samples per sweep (default 121)")->type_name("N");
    cmd->add_option("--gap-at-z0", a->gap_at_z0, "Absolute gap at z = 0 (default: the closest gap)")->type_name("LENGTH");
    cmd->add_option("--sweeps", a->sweeps, "retract, approach or approach_retract (default retract)")
        ->type_name("KIND");
    cmd->add_option("--noise", a->noise, "Standard deviation of the white current noise, e.g. 1pA (default 0)")
        ->type_name("CURRENT");
    cmd->add_option("--baseline", a->baseline, "Additive current offset of the noise floor, e.g. 0.5pA (default 0)")
        ->type_name("CURRENT");
    cmd->add_option("--saturation", a->saturation, "Amplifier clip level, e.g. 3nA (default: none)")->type_name("CURRENT");
    cmd->add_option("--drift", a->drift, "Piezo drift over the whole file (gap error linear in time), e.g. 0.02nm")
        ->type_name("LENGTH");
    cmd->add_option("--jump-gap", a->jump_gap, "Jump to contact below this true gap, e.g. 0.3nm (default: none)")
        ->type_name("LENGTH");
    cmd->add_option("--contact-conductance", a->contact_conductance, "Conductance after the jump in G0 (default 1)")
        ->type_name("G0");
    cmd->add_option("--seed", a->seed, "Seed of the std::mt19937_64 noise generator (default 1)")->type_name("N");
    cmd->add_option("--tip-label", a->tip_label, "Text for the '# tip:' metadata")->type_name("TEXT");
    cmd->add_option("--sample-label", a->sample_label, "Text for the '# sample:' metadata")->type_name("TEXT");
    cmd->add_option("--grid", a->grid, "Grid mode: NXxNY pixels, one retract curve each, in one long CSV")
        ->type_name("NXxNY");
    cmd->add_option("--pitch", a->pitch, "Grid pixel spacing (default 1nm)")->type_name("LENGTH");
    cmd->add_option("--points-per-curve", a->points_per_curve, "Grid mode: samples per pixel (default 128)")
        ->type_name("N");
    cmd->add_option("--pattern", a->pattern, "Grid pattern: uniform or disc (default disc)")->type_name("KIND");
    cmd->add_option("--disc-radius", a->disc_radius, "Disc radius (default a quarter of the shorter side)")
        ->type_name("LENGTH");
    cmd->add_option("--disc-centre", a->disc_centre, "Disc centre X,Y (default the grid centre)")->type_name("X,Y");
    cmd->add_option("--disc-work-function", a->disc_wf, "Sample work function inside the disc (default 4.3eV)")
        ->type_name("ENERGY");
    cmd->add_flag("--zv", a->zv, "Write a constant-current z(V) trace (exact model, with its resonances) instead: "
                                 "--bias FROM..TO (default 4V..10V), --current, --z-noise, --points, --seed");
    cmd->add_option("--current", a->current, "--zv: setpoint current (default 1nA)")->type_name("CURRENT");
    cmd->add_option("--z-noise", a->z_noise, "--zv: standard deviation of white z noise, e.g. 2pm (default 0)")
        ->type_name("LENGTH");
    cmd->callback([a, cmd]() { run(*a, cmd); });
}

}  // namespace tipgap::cli
