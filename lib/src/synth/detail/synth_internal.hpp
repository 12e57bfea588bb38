#pragma once
// Internals shared by synth_*.cpp.
#include <span>
#include <string>
#include <vector>
#include <yaml-cpp/yaml.h>

#include "tipgap/synth/synth.hpp"

namespace tipgap::detail {

// A truth file (curve or z(V)) as YAML, read with the configuration size cap (1 MiB); an unreadable
// file or bad YAML throws tipgap::error (input) at its file, line and column.
YAML::Node load_truth_yaml(const std::string& path);

// The config with the tip and sample work functions set (J).
config with_work_functions(const config& c, double tip_J, double sample_J);

// Model truth over the gap range for one config (fills the range/local fields of synth_truth).
void model_range_truth(const config& c, const synth_options& o, synth_truth& t);

// Weighted straight-line fit of ln|I| against z over the points with use[k], weights (I/σ)²
// (shape I² when σ = 0); returns κ = -slope/2 (1/m), NaN with fewer than 3 points.
double expected_decay(std::span<const double> z_m, std::span<const double> current_A, const std::vector<bool>& use);

// Whether a noise-free current would be usable by the fitter: above the expected floor, below
// saturation.
bool usable_current(double abs_current_A, const synth_options& o);

// "key: value" YAML scalar text: a double-quoted string with \ and " escaped.
std::string yaml_quote(const std::string& s);

// Shortest text that keeps 7 significant digits, e.g. for currents in pA. Appends to `out`.
void append_number(std::string& out, double v, int significant = 7);

}  // namespace tipgap::detail
