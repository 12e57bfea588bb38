#pragma once
// The figure flags shared by plan and predict: --plot-floor (and, for plan, --plot-bias).
#include <string>
#include <vector>

#include "command.hpp"
#include "tipgap/figures/figures.hpp"

namespace tipgap::cli {

struct plot_flags {
    std::string floor;  // --plot-floor CURRENT
    std::string bias;   // --plot-bias BIAS (plan only)
};

// The flags bound to `f`; with_bias: also --plot-bias.
std::vector<flag> plot_flag_list(plot_flags& f, bool with_bias);

// The figure options the flags ask for (defaults where a flag is absent). Throws tipgap::error
// (usage) naming the flag for a value that is not a current or bias, or a floor ≤ 0.
figure_options to_figure_options(const plot_flags& f);

}  // namespace tipgap::cli
