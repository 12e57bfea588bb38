// tipgap synth --zv: flags -> tipgap::zv_synth_options -> synthesise_zv_trace -> files.
#include "synth_zv.hpp"

#include <fmt/format.h>

#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"
#include "tipgap/synth/zv_synth.hpp"

namespace tipgap::cli {
namespace {

double flag_value(const std::string& text, dimension d, const char* flag) {
    try {
        return parse_quantity(text, d, location{});
    } catch (const error& e) {
        throw_usage(flag, e.detail());
    }
}

// The option each field of zv_synth_options comes from, for messages.
std::string flag_of(const std::string& field) {
    if (field == "current_A") return "--current";
    if (field == "bias") return "--bias";
    if (field == "points") return "--points";
    if (field == "z_noise_m") return "--z-noise";
    return field;
}

}  // namespace

void run_synth_zv(const config& c, const zv_flags& f) {
    zv_synth_options o;
    const std::string bias = f.bias.empty() ? "4V..10V" : f.bias;
    const std::size_t dots = bias.find("..");
    if (dots == std::string::npos) throw_usage("--bias", fmt::format("--zv needs a range FROM..TO, e.g. 4V..10V, got '{}'", bias));
    o.bias_from_V = flag_value(bias.substr(0, dots), dimension::voltage, "--bias");
    o.bias_to_V = flag_value(bias.substr(dots + 2), dimension::voltage, "--bias");
    if (!f.current.empty()) o.current_A = flag_value(f.current, dimension::current, "--current");
    if (!f.z_noise.empty()) o.z_noise_m = flag_value(f.z_noise, dimension::length, "--z-noise");
    o.points = f.points;
    o.seed = f.seed;
    try {
        o.validate(c.model);
    } catch (const error& e) {
        throw_usage(flag_of(e.where().key), e.detail());
    }
    const zv_synth_trace t = synthesise_zv_trace(c, o);
    write_zv_trace(t, c, o, f.out, f.truth, f.command_line);
    fmt::print("wrote {} ({} points, synthetic z(V) at {:g} nA) and {}\n", f.out, t.bias_V.size(), o.current_A * 1e9, f.truth);
    fmt::print("sample work function {:.4f} eV; resonances of the noise-free dz/dV at", t.sample_work_function_J / si::electron_volt);
    for (double v : t.peaks_V) fmt::print(" {:.3f}", v);
    fmt::print(" V\n");
}

}  // namespace tipgap::cli
