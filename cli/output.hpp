#pragma once
// Shared output helpers for the subcommands: the --format enum and writing a report to stdout or
// atomically to --output.
#include <CLI/CLI.hpp>
#include <string>
#include <string_view>

namespace tipgap::cli {

enum class output_format { table, csv, json };

// "table", "csv", "json": the one place for the names used on the command line.
const char* to_string(output_format f);
bool from_string(std::string_view s, output_format& out);

// Adds --format table|csv|json to `cmd`, storing into `format`.
CLI::Option* add_format_option(CLI::App* cmd, output_format& format);

// Writes `content` to stdout when `path` is empty or "-", else atomically to `path`.
void write_output(const std::string& path, std::string_view content);

// A double at full precision (17 significant digits, enough to round-trip) for CSV.
std::string full_precision(double v);

// Quotes a CSV cell when it holds a comma, quote or newline (RFC 4180).
std::string csv_cell(std::string_view s);

}  // namespace tipgap::cli
