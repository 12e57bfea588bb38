#include "output.hpp"

#include <cmath>

#include "flags.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/io/atomic_file.hpp"

namespace tipgap::cli {

flag format_flag(output_format& format) {
    return {"--format", "Output format: table (rounded, for reading), csv or json (full precision)", &format, "table|csv|json"};
}

std::vector<flag> output_flags(output_format& format, std::string& path) {
    return {format_flag(format), {"--output,-o", "Write the result to FILE (atomically) instead of standard output", &path}};
}

std::vector<flag> uncertainty_flags(uncertainty_options& o) {
    return {{"--mc-samples",
             "Monte Carlo draws for the config's input uncertainties (default 400; 0: linear propagation only)",
             &o.samples, "", false, std::pair{0, 1000000}},
            {"--seed", "Seed of the Monte Carlo draws (default 1); the same seed gives the same result", &o.seed}};
}

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

void write_output(const std::string& path, std::string_view content) {
    if (path.empty() || path == "-") {
        write_stdout(content);
        return;
    }
    write_file_atomically(path, content);
}

void print_warnings(const std::vector<std::string>& warnings, const std::string& context) {
    for (const auto& w : warnings) {
        if (context.empty()) {
            fmt::print(stderr, "tipgap: warning: {}\n", w);
        } else {
            fmt::print(stderr, "tipgap: warning: {}: {}\n", context, w);
        }
    }
}

}  // namespace tipgap::cli
