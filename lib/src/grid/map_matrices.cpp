#include "tipgap/grid/map_matrices.hpp"

#include "tipgap/core/constants.hpp"

namespace tipgap {

const std::vector<map_matrix>& map_matrices() {
    using b = barrier_map;
    // The scalings `tipgap map` writes its matrix files with.
    constexpr scaling to_eV = times(1.0 / si::electron_volt), to_per_nm = times(1e-9);
    static const std::vector<map_matrix> matrices = {
        {"apparent_barrier_eV", "apparent barrier height [eV]", [](const b& m) -> const std::vector<double>& { return m.apparent_barrier_J; }, to_eV},
        {"decay_constant_per_nm", "decay constant [1/nm]", [](const b& m) -> const std::vector<double>& { return m.decay_constant_per_m; }, to_per_nm},
        {"stderr_apparent_barrier_eV", "standard error of the apparent barrier height [eV]",
         [](const b& m) -> const std::vector<double>& { return m.apparent_barrier_stderr_J; }, to_eV},
        {"stderr_decay_constant_per_nm", "standard error of the decay constant [1/nm]",
         [](const b& m) -> const std::vector<double>& { return m.decay_constant_stderr_per_m; }, to_per_nm},
        {"r_squared", "R^2 of the fit", [](const b& m) -> const std::vector<double>& { return m.r_squared; }, {}},
    };
    return matrices;
}

}  // namespace tipgap
