#pragma once
// The parts of the compiled module _tipgap, one file each; module.cpp calls them in turn. The
// public API (docstrings, broadcasting, keyword defaults) is the Python package around it,
// lib/python/tipgap/__init__.py.
#include <pybind11/pybind11.h>

namespace tipgap::python {

namespace pybind = pybind11;

void bind_config(pybind::module_& m);  // Config
void bind_plan(pybind::module_& m);    // _predict, _plan
void bind_fit(pybind::module_& m);     // _fit, _read_curve
void bind_map(pybind::module_& m);     // _map, _read_grid
void bind_synth(pybind::module_& m);   // _synth_curve

}  // namespace tipgap::python
