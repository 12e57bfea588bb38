// tipgap: a planar vacuum-gap tunnelling model, setpoint planner and I(z) fitter for STM users.
// This umbrella header includes every public header, area by area (each area is a folder under
// tipgap/ with the same name under lib/src/):
//   core     units, errors, physical constants (CODATA 2018), enum names
//   model    barrier, image potential, WKB transmission, supply, current density, closed forms, tip geometry
//   config   the YAML junction description and the embedded materials library
//   plan     forward predictions, setpoint (gap) solver, uncertainty propagation, warnings, teaching table
//   fit      apparent barrier height and decay constant from measured I(z) curves; model comparison
//   grid     spectroscopy grids: streamed readers, checks and barrier-height maps
//   io       reading measured curves, atomic output files and directories, declared output columns
//   synth    synthetic curves and grids with documented ground truth (demos and tests only)
//   plot     the drawing engine (PLplot): x-y panels, colour maps, histograms
//   figures  every figure a command writes, computed from library results
//   demo     the `tipgap demo` report
#pragma once

#include "tipgap/core/constants.hpp"
#include "tipgap/core/enum_names.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/core/error_line.hpp"
#include "tipgap/core/key_names.hpp"
#include "tipgap/core/units.hpp"
#include "tipgap/core/usage_message.hpp"

#include "tipgap/model/barrier.hpp"
#include "tipgap/model/closed_forms.hpp"
#include "tipgap/model/current.hpp"
#include "tipgap/model/geometry.hpp"
#include "tipgap/model/model.hpp"
#include "tipgap/model/transmission.hpp"
#include "tipgap/model/wkb.hpp"

#include "tipgap/config/config.hpp"
#include "tipgap/config/config_summary.hpp"

#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/plan_columns.hpp"
#include "tipgap/plan/predict.hpp"
#include "tipgap/plan/predict_columns.hpp"
#include "tipgap/plan/reference_table.hpp"
#include "tipgap/plan/reference_table_columns.hpp"
#include "tipgap/plan/uncertainty.hpp"
#include "tipgap/plan/uncertainty_columns.hpp"
#include "tipgap/plan/warnings.hpp"

#include "tipgap/fit/fit.hpp"
#include "tipgap/fit/fit_columns.hpp"
#include "tipgap/fit/fit_report.hpp"
#include "tipgap/fit/fit_summary.hpp"
#include "tipgap/fit/fitted_sweep.hpp"
#include "tipgap/fit/model_fit.hpp"

#include "tipgap/grid/grid.hpp"
#include "tipgap/grid/grid_arrays.hpp"
#include "tipgap/grid/map.hpp"
#include "tipgap/grid/map_files.hpp"
#include "tipgap/grid/map_matrices.hpp"

#include "tipgap/io/atomic_directory.hpp"
#include "tipgap/io/atomic_file.hpp"
#include "tipgap/io/columns.hpp"
#include "tipgap/io/curve_arrays.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/io/report.hpp"

#include "tipgap/synth/synth.hpp"
#include "tipgap/synth/synth_columns.hpp"

#include "tipgap/plot/plot.hpp"

#include "tipgap/figures/demo_figures.hpp"
#include "tipgap/figures/map_directory.hpp"
#include "tipgap/figures/figures.hpp"
#include "tipgap/figures/fit_plot.hpp"
#include "tipgap/figures/map_figures.hpp"

#include "tipgap/demo/demo.hpp"
#include "tipgap/demo/demo_columns.hpp"
#include "tipgap/demo/demo_text.hpp"
