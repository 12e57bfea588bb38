#include "plot_flags.hpp"

#include "flags.hpp"
#include <cmath>

namespace tipgap::cli {

std::vector<flag> plot_flag_list(plot_flags& f, bool with_bias) {
    std::vector<flag> out{{"--plot-floor",
                           "Smallest |current| a figure's log current axis shows (default 1fA); curves below it are "
                           "clipped",
                           &f.floor, "CURRENT"}};
    if (with_bias)
        out.push_back({"--plot-bias",
                       "Bias of the figure's I(s), phi_ap(s) and I(V) panels: the planned setpoint nearest to it "
                       "(default: the first)",
                       &f.bias, "BIAS"});
    return out;
}

figure_options to_figure_options(const plot_flags& f) {
    figure_options o;
    if (!f.floor.empty()) o.current_floor_A = std::abs(flag_quantity(f.floor, dimension::current, "--plot-floor"));
    if (!f.bias.empty()) o.side_bias_V = flag_quantity(f.bias, dimension::voltage, "--plot-bias");
    if (!(o.current_floor_A > 0)) throw_usage("--plot-floor", "must be a current above 0 A");
    return o;
}

}  // namespace tipgap::cli
