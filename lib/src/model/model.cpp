#include "tipgap/core/limits.hpp"
#include "tipgap/model/model.hpp"

#include <cmath>
#include <fmt/format.h>

#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap {

namespace {
// Throws "<key>: <value> <unit> is out of range; expected <range>" when !ok. `value` is shown in
// the unit of the range so the user sees the number they wrote.
void require(bool ok, const char* key, double value, const char* unit, const std::string& range) {
    if (ok) return;
    location w;
    w.key = key;
    std::string shown = std::isfinite(value) ? fmt::format("{:g}{}{}", value, *unit ? " " : "", unit)
                                             : std::string("a non-finite value");
    throw_input(w, fmt::format("{} is out of range; expected {}", shown, range));
}
}  // namespace

void model_options::validate() const {
    constexpr double eV = si::electron_volt;
    auto in = [](double v, double lo, double hi, bool lo_open) {
        return std::isfinite(v) && (lo_open ? v > lo : at_least(v, lo)) && at_most(v, hi);
    };
    // A work function <= 0 has no barrier to tunnel through; above 20 eV no metal exists.
    require(in(tip.work_function_J, 0, 20 * eV, true), "tip.work_function", tip.work_function_J / eV, "eV",
            "a work function in (0, 20] eV");
    require(in(sample.work_function_J, 0, 20 * eV, true), "sample.work_function", sample.work_function_J / eV, "eV",
            "a work function in (0, 20] eV");
    require(in(tip.fermi_energy_J, 0, 50 * eV, true), "tip.fermi_energy", tip.fermi_energy_J / eV, "eV",
            "a Fermi energy in (0, 50] eV");
    require(in(sample.fermi_energy_J, 0, 50 * eV, true), "sample.fermi_energy", sample.fermi_energy_J / eV, "eV",
            "a Fermi energy in (0, 50] eV");
    // K < 1 would make the image attraction stronger than in vacuum: no dielectric does that.
    require(in(relative_permittivity, 1.0, 1000.0, false), "barrier.relative_permittivity", relative_permittivity, "",
            "a relative permittivity in [1, 1000] (1 for vacuum)");
    require(in(temperature_K, 0.0, 2000.0, false), "temperature", temperature_K, "K",
            "a temperature in [0, 2000] K");
    require(in(rel_tol, 1e-12, 1e-2, false), "tolerance", rel_tol, "", "a relative tolerance in [1e-12, 1e-2]");
    require(in(bias_limit_V, 0.0, 100.0, true), "bias_limit", bias_limit_V, "V", "a bias limit in (0, 100] V");
}

}  // namespace tipgap
