#pragma once
// The per-pixel matrices of a barrier map, declared once: key (with its unit, the file stem of
// `tipgap map`'s matrix files and the Python module's dict key), what it holds, its values and
// their scaling from SI to the output unit. Like the declared columns (tipgap/io/columns.hpp), for
// matrices instead of rows.
#include <functional>
#include <string>
#include <vector>

#include "tipgap/grid/map.hpp"
#include "tipgap/io/columns.hpp"

namespace tipgap {

struct map_matrix {
    std::string key;   // "apparent_barrier_eV"
    std::string what;  // "apparent barrier height [eV]", for a file's first line
    std::function<const std::vector<double>&(const barrier_map&)> values;  // row-major, nx * ny, SI; NaN: no value
    scaling scale;     // SI -> the unit in the key
};

// apparent_barrier_eV, decay_constant_per_nm, stderr_apparent_barrier_eV (the three matrix files of
// `tipgap map`, with their scaling), then stderr_decay_constant_per_nm and r_squared.
const std::vector<map_matrix>& map_matrices();

}  // namespace tipgap
