#include "output.hpp"

#include <cmath>
#include <cstdio>
#include <fmt/format.h>

#include "tipgap/atomic_file.hpp"

namespace tipgap::cli {

const char* to_string(output_format f) {
    switch (f) {
        case output_format::table: return "table";
        case output_format::csv: return "csv";
        case output_format::json: return "json";
    }
    return "table";
}

bool from_string(std::string_view s, output_format& out) {
    for (output_format f : {output_format::table, output_format::csv, output_format::json}) {
        if (s == to_string(f)) {
            out = f;
            return true;
        }
    }
    return false;
}

CLI::Option* add_format_option(CLI::App* cmd, output_format& format) {
    return cmd
        ->add_option_function<std::string>(
            "--format",
            [&format](const std::string& s) {
                if (!from_string(s, format)) throw CLI::ValidationError("--format", "expected table, csv or json, got '" + s + "'");
            },
            "Output format: table (rounded, for reading), csv or json (full precision)")
        ->type_name("table|csv|json");
}

void write_output(const std::string& path, std::string_view content) {
    if (path.empty() || path == "-") {
        std::fwrite(content.data(), 1, content.size(), stdout);
        std::fflush(stdout);
        return;
    }
    write_file_atomically(path, content);
}

std::string full_precision(double v) {
    if (std::isnan(v)) return "nan";
    return fmt::format("{:.17g}", v);
}

std::string csv_cell(std::string_view s) {
    if (s.find_first_of(",\"\n\r") == std::string_view::npos) return std::string(s);
    std::string out = "\"";
    for (char c : s) {
        if (c == '"') out += '"';
        out += c;
    }
    out += '"';
    return out;
}

}  // namespace tipgap::cli
