#pragma once
// Shared CLI plumbing: output formats, tables, writing to stdout or atomically to --output.
#include <CLI/CLI.hpp>
#include <nlohmann/json.hpp>
#include <string>
#include <string_view>
#include <vector>

#include "tipgap/config/config.hpp"
#include "tipgap/core/enum_names.hpp"
#include "tipgap/plan/uncertainty.hpp"

namespace tipgap::cli {
enum class output_format { table, csv, json };
}  // namespace tipgap::cli

namespace tipgap {
// "table", "csv", "json": the names used on the command line (tipgap/core/enum_names.hpp).
template <>
struct enum_names<cli::output_format> {
    static constexpr enum_name<cli::output_format> table[] = {
        {cli::output_format::table, "table"}, {cli::output_format::csv, "csv"}, {cli::output_format::json, "json"}};
};
}  // namespace tipgap

namespace tipgap::cli {

// Adds --format table|csv|json to `cmd`, storing into `format`.
CLI::Option* add_format_option(CLI::App* cmd, output_format& format);

// Adds --format table|csv|json and --output FILE to a subcommand.
void add_output_options(CLI::App* cmd, output_format& format, std::string& output_path);

// Writes `content` to stdout when `path` is empty or "-", else atomically to `path`.
void write_output(const std::string& path, std::string_view content);

// Quotes a CSV cell when it holds a comma, quote or newline (RFC 4180).
std::string csv_cell(std::string_view s);

// A table of strings with a header row: rendered aligned for reading, or as CSV.
struct text_table {
    std::vector<std::string> headers;
    std::vector<std::vector<std::string>> rows;
    std::string render() const;
};

// A double at full precision (17 significant digits, enough to round-trip) for CSV.
std::string full_precision(double v);
// Rounded for tables: `digits` significant digits.
std::string rounded(double v, int digits = 4);

// CSV line from cells (each through csv_cell), ending in a newline.
std::string csv_line(const std::vector<std::string>& cells);

// --config FILE, or the built-in default when empty.
tipgap::config load_config_or_default(const std::string& path);

// JSON summary of a configuration (for output metadata).
nlohmann::json config_json(const tipgap::config& c);

// Adds the uncertainty of each output to a point's JSON: NAME_stddev, NAME_ci95 [lo, hi] and
// NAME_mc_mean (Monte Carlo, when drawn), NAME_linear_stddev and NAME_linear_ci95 (when computed).
void add_uncertainty_json(nlohmann::json& point, const tipgap::uncertainty_summary& u);

// The "uncertainty" block of a command's JSON: method, inputs, samples, seed, redrawn, failed.
nlohmann::json uncertainty_info_json(const tipgap::uncertainty_summary& u);

// "value ± u" for tables (rounded); just the value when u is NaN.
std::string rounded_pm(double value, double u, int digits = 4);

// Adds --mc-samples N and --seed S (Monte Carlo draws for configured input uncertainties).
void add_uncertainty_options(CLI::App* cmd, tipgap::uncertainty_options& o);

// Prints each warning to stderr as "tipgap: warning: ...".
void print_warnings(const std::vector<std::string>& warnings, const std::string& context = "");

}  // namespace tipgap::cli
