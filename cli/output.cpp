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

}  // namespace tipgap::cli
