#pragma once
// The resonance section of `tipgap demo` (cmd_demo.cpp): the z(V) traces of demo_scans/resonances/.
#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>

#include "tipgap/demo/demo.hpp"

namespace tipgap::cli {

// resonance-<stem>.png
std::string resonance_plot_name(const demo_resonance& d);
// The printed section: one line per trace (peaks, fitted and formula work function, truth).
std::string resonance_summary(const demo_report& r);
// The "resonances" array of demo.json.
nlohmann::ordered_json resonance_json(const demo_report& r, const std::string& out_dir);
// One figure per trace into dir.
void write_resonance_figures(const demo_report& r, const std::filesystem::path& dir);

}  // namespace tipgap::cli
