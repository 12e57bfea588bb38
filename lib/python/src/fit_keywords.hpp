#pragma once
// The fit options of tipgap.fit and tipgap.map as Python keywords: the CLI's fit flags in snake
// case with units in the names (noise_floor_A, window_nm, confidence, ...).
#include <pybind11/pybind11.h>

#include "tipgap/fit/fit.hpp"

namespace tipgap::python {

// fit_options from the keywords the caller gave (absent or None: the library's default), validated
// with errors naming the keywords. function: "fit" or "map".
fit_options fit_options_from(const pybind11::dict& keywords, const char* function);

}  // namespace tipgap::python
