#pragma once
// The junction: tip and sample electrodes, barrier options, temperature, method and tolerance.
#include <string>

#include "tipgap/core/constants.hpp"
#include "tipgap/core/enum_names.hpp"

namespace tipgap {

enum class image_kind {
    none,         // plain trapezoid
    exact,        // method-of-images series between two grounded planes (digamma closed form)
    approximate,  // Simmons 1963 closed form -1.15 lambda s^2 / (x (s - x))
};
enum class method_kind {
    wkb,      // numerical WKB transmission and Tsu-Esaki energy integral
    simmons,  // Simmons 1963 intermediate-voltage closed form over the same barrier; where the
              // formula is invalid (collapsed barrier, or thinner than about one decay length,
              // A sqrt(phibar) < 2) the numerical WKB result is used instead
    exact,    // Schrödinger equation through the barrier (tipgap/model/exact_transmission.hpp) and
              // the same Tsu-Esaki energy integral; field-emission resonances included
};

// Names in YAML, on the command line and in JSON (tipgap/core/enum_names.hpp); message order.
template <>
struct enum_names<image_kind> {
    static constexpr enum_name<image_kind> table[] = {
        {image_kind::exact, "exact"}, {image_kind::approximate, "approximate"}, {image_kind::none, "none"}};
};
template <>
struct enum_names<method_kind> {
    static constexpr enum_name<method_kind> table[] = {
        {method_kind::wkb, "wkb"}, {method_kind::simmons, "simmons"}, {method_kind::exact, "exact"}};
};

struct electrode {
    std::string material;                              // name from the materials library, or empty
    double work_function_J = 4.5 * si::electron_volt;  // J, (0, 20 eV]
    double fermi_energy_J = 5.5 * si::electron_volt;   // J, free-electron Fermi energy, (0, 50 eV]
};

struct model_options {
    electrode tip;                          // at x = 0
    electrode sample;                       // at x = s; V is the sample bias
    image_kind image = image_kind::exact;
    double relative_permittivity = 1.0;     // K of the gap medium, >= 1 (vacuum 1)
    double temperature_K = 4.2;             // K, [0, 2000]
    method_kind method = method_kind::wkb;
    double rel_tol = 1e-6;                  // relative accuracy of J, [1e-12, 1e-2]
    double bias_limit_V = 10.0;             // |V| above this is rejected, (0, 100] V

    // Throws tipgap::error (input) naming the offending field when a value is out of range.
    void validate() const;
};

}  // namespace tipgap
