#pragma once
// How a command describes itself to main.cpp, the one file that includes CLI11 (a large
// header-only library, slow to compile): its flags, each bound to a field of the command's
// arguments, and what it runs once they are parsed. Each cmd_*.cpp reads: flags -> options ->
// library call -> declared columns (tipgap/io/columns.hpp).
#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <type_traits>
#include <utility>
#include <variant>
#include <vector>

#include "tipgap/io/report.hpp"

namespace tipgap::cli {

// std::uint64_t covers std::size_t on the LP64 systems tipgap builds on.
static_assert(std::is_same_v<std::size_t, std::uint64_t>);

struct flag {
    std::string names;  // "--gap", "--config,-c", or the name of a positional argument ("files")
    std::string help;
    std::variant<std::string*, int*, double*, bool*, std::uint64_t*, std::vector<std::string>*, output_format*> target;
    std::string type_name = "";                               // "" : CLI11's name for the type
    bool required = false;
    std::optional<std::pair<int, int>> range = std::nullopt;  // allowed values of an integer
    std::string default_text = "";                            // the default as the help shows it
    std::function<void()> then = nullptr;  // run when the flag is given, before required flags are checked
};

// Thrown by a flag's `then` that has done the whole job (--show-config): main exits with 0.
struct finished {};

struct command {
    std::string name;
    std::string description;
    std::vector<flag> flags = {};
    // Runs the command. line: the command as parsed ("tipgap synth --out x.csv ..."), for the
    // metadata of the files it writes.
    std::function<void(const std::string& line)> run = nullptr;
};

command predict_command();
command plan_command();
command table_command();
command fit_command();    // decay constant and apparent barrier of measured I(z) curves
command map_command();    // barrier-height maps of a spectroscopy grid
command synth_command();  // synthetic curves and grids with their ground truth
command resonances_command();  // field-emission resonances and the local work function
command demo_command();   // the main job on the built-in config and the demo scans

}  // namespace tipgap::cli
