#include "figures/detail/current_unit.hpp"

namespace tipgap::figures_detail {

current_unit_choice current_unit(double max_abs_A) {
    if (max_abs_A < 1e-9) return {1e12, "pA"};
    if (max_abs_A < 1e-6) return {1e9, "nA"};
    if (max_abs_A < 1e-3) return {1e6, "µA"};
    return {1e3, "mA"};
}

}  // namespace tipgap::figures_detail
