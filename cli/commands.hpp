#pragma once
// Each subcommand adds itself to the app; main() lists them. No physics here.
#include <CLI/CLI.hpp>

namespace tipgap::cli {

void add_predict(CLI::App& app);
void add_plan(CLI::App& app);
void add_table(CLI::App& app);

// tipgap fit: decay constant and apparent barrier height of measured I(z) curves (cmd_fit.cpp).
void add_fit(CLI::App& app);

// tipgap map: barrier-height maps of a spectroscopy grid (cmd_map.cpp).
void add_map(CLI::App& app);

// tipgap synth: synthetic curves and grids with their ground truth (cmd_synth.cpp).
void add_synth(CLI::App& app);

// tipgap resonances: field-emission resonances and the local work function (cmd_resonances.cpp).
void add_resonances(CLI::App& app);

// tipgap demo: the main job on the built-in config and the demo scans (cmd_demo.cpp).
void add_demo(CLI::App& app);

}  // namespace tipgap::cli
