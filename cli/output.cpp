#include "output.hpp"

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

std::string config_line(const config& c) {
    return fmt::format("# {} · T = {} K · image {} · method {} · geometry {}", c.source, c.model.temperature_K,
                       to_string(c.model.image), to_string(c.model.method), to_string(c.geometry.kind));
}

const uncertainty_summary* first_uncertain(const std::vector<uncertainty_summary>& u) {
    for (const auto& x : u)
        if (!x.inputs.empty()) return &x;
    return nullptr;
}

std::string uncertainty_line(const std::vector<uncertainty_summary>& u, const char* of) {
    const uncertainty_summary* x = first_uncertain(u);
    if (!x) return "";
    if (x->samples > 0)
        return fmt::format("# ± : Monte Carlo standard uncertainty{}, {} draws, seed {} (inputs: {})\n", of, x->samples,
                           x->seed, fmt::join(x->inputs, ", "));
    return fmt::format("# ± : linear propagation (inputs: {})\n", fmt::join(x->inputs, ", "));
}

}  // namespace tipgap::cli
