#pragma once
// Shared CLI plumbing: the output and figure flags, writing to stdout or atomically to --output,
// warnings on stderr. (render(), which picks the table, the CSV or the JSON, is tipgap/io/report.hpp.)
#include <cstdio>
#include <fmt/format.h>
#include <string>
#include <string_view>
#include <vector>

#include "command.hpp"
#include "tipgap/figures/figures.hpp"
#include "tipgap/io/report.hpp"
#include "tipgap/plan/uncertainty.hpp"

namespace tipgap::cli {

// --format table|csv|json.
flag format_flag(output_format& format);
// --format and --output,-o FILE.
std::vector<flag> output_flags(output_format& format, std::string& path);
// --mc-samples N and --seed S (Monte Carlo draws for configured input uncertainties).
std::vector<flag> uncertainty_flags(uncertainty_options& o);

// The figure flags of plan and predict: --plot-floor CURRENT and (plan) --plot-bias BIAS.
struct plot_flags {
    std::string floor;
    std::string bias;
};
// The flags bound to `f`; with_bias: also --plot-bias.
std::vector<flag> plot_flag_list(plot_flags& f, bool with_bias);
// The figure options the flags ask for (defaults where a flag is absent). Throws tipgap::error
// (usage) naming the flag for a value that is not a current or bias, or a floor <= 0.
figure_options to_figure_options(const plot_flags& f);

// Writes `content` to stdout when `path` is empty or "-", else atomically to `path`.
void write_output(const std::string& path, std::string_view content);

// Prints each warning to stderr as "tipgap: warning: [context: ]...".
void print_warnings(const std::vector<std::string>& warnings, const std::string& context = "");

// Prints the warnings of the first three items that have any (context(item) names the item), then
// how many more `noun` have warnings.
template <class Items, class Context>
void print_first_warnings(const Items& items, Context context, const char* noun) {
    std::size_t shown = 0, warned = 0;
    for (const auto& x : items) {
        if (x.warnings.empty()) continue;
        ++warned;
        if (shown++ < 3) print_warnings(x.warnings, context(x));
    }
    if (warned > 3) fmt::print(stderr, "tipgap: warning: ... and {} more {} with warnings (see the output)\n", warned - 3, noun);
}

}  // namespace tipgap::cli
