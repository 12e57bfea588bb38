#pragma once
// Shared CLI plumbing: the output flags, writing to stdout or atomically to --output, warnings on
// stderr, and render(): the one place that picks the table, the CSV or the JSON of declared columns.
#include <cstdio>
#include <fmt/format.h>
#include <string>
#include <string_view>
#include <vector>

#include "command.hpp"
#include "tipgap/config/config.hpp"
#include "tipgap/io/columns.hpp"
#include "tipgap/plan/uncertainty.hpp"

namespace tipgap::cli {

// --format table|csv|json.
flag format_flag(output_format& format);
// --format and --output,-o FILE.
std::vector<flag> output_flags(output_format& format, std::string& path);
// --mc-samples N and --seed S (Monte Carlo draws for configured input uncertainties).
std::vector<flag> uncertainty_flags(uncertainty_options& o);

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

// "# <source> · T = ... K · image ... · method ... · geometry ...": the first line of a table.
std::string config_line(const config& c);

// "# ± : ..." saying what the ± of a table is, or "" without uncertain inputs. of: what it is the
// uncertainty of (" of I"), or "".
std::string uncertainty_line(const std::vector<uncertainty_summary>& u, const char* of);
// The first summary with uncertain inputs, or nullptr.
const uncertainty_summary* first_uncertain(const std::vector<uncertainty_summary>& u);

// What goes around the rows in each format.
struct report_frame {
    record json = record{};     // the JSON document; the rows are added under rows_key
    std::string rows_key = "";
    bool sort_keys = false;     // JSON keys in byte order (predict, plan and table always wrote them so)
    std::string before_table = "";  // lines above the table
    std::string after_table = "";   // lines below it
    table_layout layout = {};
};

// The rows in the asked format: the table, the CSV, or the JSON document with the rows in it.
template <class T, class Rows>
std::string render(output_format f, const std::vector<column<T>>& columns, const Rows& rows, report_frame frame) {
    if (f == output_format::csv) return format_csv(columns, rows);
    if (f == output_format::table) return frame.before_table + format_table(columns, rows, frame.layout) + frame.after_table;
    frame.json.set(frame.rows_key, to_records(columns, rows));
    return json_text(frame.json, frame.sort_keys);
}

}  // namespace tipgap::cli
