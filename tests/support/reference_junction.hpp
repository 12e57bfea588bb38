#pragma once
// The junction that the reference tables of the model tests were computed for: a tungsten tip of
// 4.5 eV work function and 9.0 eV Fermi energy over a gold sample of 5.3 eV and 5.5 eV, 4.2 K,
// exact image potential, WKB, 1 nm^2. It was tipgap's built-in default until the default took its
// numbers from the materials library (issue 15: 4.55 eV and 5.31 eV); the SciPy and README
// reference values below stay valid for this junction, so the tests keep it by name.
#include "tipgap/config/config.hpp"

namespace tipgap_test {

inline tipgap::config reference_junction() {
    return tipgap::parse_config("tip:    { material: tungsten, work_function: 4.5 eV, fermi_energy: 9.0 eV }\n"
                                "sample: { material: gold, work_function: 5.3 eV, fermi_energy: 5.5 eV }\n",
                                "<reference junction>");
}

}  // namespace tipgap_test
