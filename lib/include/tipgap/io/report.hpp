#pragma once
// One report in one of three formats: the rounded table for reading (with lines above and below
// it), the CSV, or a JSON document with the rows under a key; all from declared columns
// (tipgap/io/columns.hpp), so that every format shows the same fields.
#include <string>
#include <vector>

#include "tipgap/core/enum_names.hpp"
#include "tipgap/io/columns.hpp"

namespace tipgap {

enum class output_format { table, csv, json };

// "table", "csv", "json": the names of the output formats.
template <>
struct enum_names<output_format> {
    static constexpr enum_name<output_format> table[] = {
        {output_format::table, "table"}, {output_format::csv, "csv"}, {output_format::json, "json"}};
};

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

}  // namespace tipgap
