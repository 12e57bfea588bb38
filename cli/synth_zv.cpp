// tipgap synth --zv: flags -> tipgap::zv_synth_options -> synthesise_zv_trace -> files.
#include "synth_zv.hpp"

#include <fmt/format.h>

#include "flags.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/synth/zv_synth.hpp"

namespace tipgap::cli {

void run_synth_zv(const config& c, const zv_flags& f) {
    zv_synth_options o;
    const std::string bias = f.bias.empty() ? "4V..10V" : f.bias;
    const std::size_t dots = bias.find("..");
    if (dots == std::string::npos) throw_usage("--bias", fmt::format("--zv needs a range FROM..TO, e.g. 4V..10V, got '{}'", bias));
    o.bias_from_V = flag_quantity(bias.substr(0, dots), dimension::voltage, "--bias");
    o.bias_to_V = flag_quantity(bias.substr(dots + 2), dimension::voltage, "--bias");
    if (!f.current.empty()) o.current_A = flag_quantity(f.current, dimension::current, "--current");
    if (!f.z_noise.empty()) o.z_noise_m = flag_quantity(f.z_noise, dimension::length, "--z-noise");
    o.points = f.points;
    o.seed = f.seed;
    naming_flags("synth", flag_error::usage, [&] { o.validate(c.model); });
    const zv_synth_trace t = synthesise_zv_trace(c, o);
    write_zv_trace(t, c, o, f.out, f.truth, f.command_line);
    fmt::print("wrote {} ({} points, synthetic z(V) at {:g} nA) and {}\n", f.out, t.bias_V.size(), o.current_A * 1e9, f.truth);
    fmt::print("sample work function {:.4f} eV; resonances of the noise-free dz/dV at", t.sample_work_function_J / si::electron_volt);
    for (double v : t.peaks_V) fmt::print(" {:.3f}", v);
    fmt::print(" V\n");
}

}  // namespace tipgap::cli
