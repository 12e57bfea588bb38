#pragma once
// Declared output columns. A result type lists its columns once (JSON key, table label, unit
// scaling, table precision, getter), and one formatter writes the aligned table, the CSV and the
// JSON of any list of such results from that list, the way fmt writes every type through one
// formatter<T>. Adding a field to a result is one line in its declaration, and every format shows it.
//
// The values are library types (cell, record), not a JSON library's: the CLI turns them into text
// here (json_text), and the Python module turns the same records into dicts with the same keys.
#include <cmath>
#include <concepts>
#include <cstdint>
#include <functional>
#include <initializer_list>
#include <limits>
#include <string>
#include <string_view>
#include <utility>
#include <variant>
#include <vector>

namespace tipgap {

struct cell;

// Named values in order: one JSON object.
struct record {
    std::vector<std::pair<std::string, cell>> fields;
    // JSON: write the keys in byte order, as a sorted map would (the order earlier versions wrote).
    bool sorted_keys = false;

    // Adds `key`, or replaces its value in place when it is already there.
    void set(const std::string& key, cell value);
};

// A value that is left out: JSON omits its key, CSV and tables show an empty (or "none") cell.
struct absent {};

// One output value: null (JSON null, e.g. no regime for an unreachable setpoint), absent, a number
// (a double, in SI until the column scales it), an integer, yes/no, text, a list of texts (warnings),
// or, for JSON only, a list or a nested record.
struct cell {
    using list = std::vector<cell>;
    std::variant<std::monostate, absent, double, std::int64_t, std::uint64_t, bool, std::string,
                 std::vector<std::string>, list, record>
        value;

    cell() = default;
    cell(absent a) : value(a) {}
    cell(double v) : value(v) {}
    cell(bool v) : value(v) {}
    template <std::signed_integral I>
        requires(!std::same_as<I, bool>)
    cell(I v) : value(static_cast<std::int64_t>(v)) {}
    template <std::unsigned_integral I>
        requires(!std::same_as<I, bool>)
    cell(I v) : value(static_cast<std::uint64_t>(v)) {}
    cell(std::string v) : value(std::move(v)) {}
    cell(const char* v) : value(std::string(v)) {}
    cell(std::vector<std::string> v) : value(std::move(v)) {}
    cell(list v) : value(std::move(v)) {}
    cell(record v) : value(std::move(v)) {}

    bool is_absent() const { return std::holds_alternative<absent>(value); }
};

// SI value -> output unit. Some outputs divide by the unit (m / 1e-9) and others multiply by its
// inverse (m * 1e9); the two differ in the last bit, and every format prints full precision, so a
// column keeps the spelling its output has always had.
struct scaling {
    double factor = 1.0;
    bool divide = false;
    double operator()(double si) const { return divide ? si / factor : si * factor; }
};
inline constexpr scaling times(double f) { return {f, false}; }
inline constexpr scaling divided_by(double f) { return {f, true}; }

// How a table shows a number: `digits` significant digits ("0.1235", "1.235e-09", "NaN"), or
// `digits` decimals ("0.124", "nan").
enum class number_style { significant, fixed };
struct table_number {
    number_style style = number_style::significant;
    int digits = 4;
};
inline constexpr table_number fixed(int decimals) { return {number_style::fixed, decimals}; }

// Where a column appears.
inline constexpr unsigned in_table = 1, in_csv = 2, in_json = 4;
inline constexpr unsigned in_data = in_csv | in_json, everywhere = in_table | in_csv | in_json;

// Declare lists as `std::vector<column<T>> out = {...}; return out;`: GCC 12.2 stops with an
// internal error on `return {...};` of such a list.
template <class T>
struct column {
    std::string key = "";               // JSON key and CSV header, unit in the name: "gap_nm". A JSON
                                        // column with an empty key and a record value is merged into the row.
    std::string label = "";             // table header with its unit: "gap [nm]"
    std::function<cell(const T&)> get = nullptr;  // the value; numbers in SI, scaled by `scale`
    scaling scale = {};
    table_number number = {};
    unsigned shown = everywhere;
    // Table only: "value ± spread" when set and finite (in the output unit, not scaled).
    std::function<double(const T&)> spread = nullptr;
    std::string none = "";  // table text of a null or absent value
    int width = 0;          // table width for fixed layouts (0: as wide as the widest cell)
    bool left = false;      // left-aligned in the table
    // Table only: the SI unit ("A", "Ω", "V", "m") of the getter's values (and of the spread). The
    // table then ignores `scale`, picks a prefix for reading (pA, nA, µA; mV; pm, nm) from the
    // column's largest magnitude and labels it "<label> [<prefix><unit>]".
    std::string reading_unit = "";
};

// How a table is laid out: a dashed rule under the header or not. Columns are as wide as their
// widest cell unless they declare a width (then a longer cell overflows, as printf does).
struct table_layout {
    bool rule = true;
};

// ---------------------------------------------------------------------------------------------
// The formatter. Non-template parts; the templates below evaluate the getters.

// Text of a CSV cell: numbers with 17 significant digits (enough to read back the same double),
// "nan" for NaN; yes/no; lists joined by "; "; null and absent empty; quoted when needed (RFC 4180).
std::string csv_text(const cell& c);
// Text of a table cell, with the column's number format and its spread (NaN: none).
std::string table_text(const cell& c, const table_number& n, const std::string& none, double spread);
// `digits` significant digits, fixed notation between 1e-3 and 1e6: "0.1235", "1.235e-09", "NaN".
std::string significant(double v, int digits = 4);
// "value ± sigma" with sigma to two significant digits and the value rounded to the same decimal
// place ("4.413 ± 0.012", "12350 ± 680", "(1.0002 ± 0.0013)e-09"); a non-zero sigma never prints
// as zero. sigma not finite or <= 0: the value alone with 4 significant digits (sigma 0: "± 0").
std::string with_uncertainty(double value, double sigma);
// "lo – hi" of an interval, both ends to the decimal place of two significant digits of its half
// width, so that the ends of a narrow interval differ ("4.398 – 4.427").
std::string interval_text(double lo, double hi);
// The factor (1e-12, 1e-9, ...) and prefix ("f", "p", "n", "µ", "m", "", "k", "M", "G") that show
// `largest` (>= 0) between 1 and 1000, the factor at least `smallest` (1e-15; lengths 1e-12: no
// femtometres at an STM); 1 and "" for 0 or non-finite.
std::pair<double, std::string> reading_prefix(double largest, double smallest = 1e-15);
// A CSV field quoted when it holds a comma, quote or line break (RFC 4180).
std::string csv_quote(const std::string& s);

struct table_column_format {
    std::string label;
    int width = 0;
    bool left = false;
};
// The table of already formatted cells.
std::string render_table(const std::vector<table_column_format>& columns,
                         const std::vector<std::vector<std::string>>& rows, const table_layout& layout);

// JSON text of a document (two-space indent, newline at the end). sort_keys: every record in byte
// order of its keys, as nlohmann::json writes them.
// Text that is not valid UTF-8 (a file name or label in another encoding) is written with U+FFFD
// for each bad byte, and an object document then gets "invalid_utf8_replaced": true.
std::string json_text(const cell& document, bool sort_keys = false);

// A cell with the column's scaling applied to a number.
cell scaled(const cell& c, const scaling& s);

// `pattern` with each "{key}" replaced by its text from `values` (key, text); throws
// std::logic_error for a key it does not know (a mistake in the program, not in the input).
std::string fill_pattern(std::string_view pattern, const std::vector<std::pair<std::string, std::string>>& values);

// ---------------------------------------------------------------------------------------------

template <class T, class Rows>
std::string format_table(const std::vector<column<T>>& columns, const Rows& rows, const table_layout& layout = {}) {
    std::vector<table_column_format> head;
    std::vector<double> factor;  // reading-unit factor of each column (1: none)
    for (const column<T>& c : columns) {
        if (!(c.shown & in_table)) continue;
        if (c.reading_unit.empty()) {
            head.push_back({c.label, c.width, c.left});
            factor.push_back(1.0);
            continue;
        }
        double largest = 0;
        for (const T& row : rows)
            if (const cell v = c.get(row); const double* x = std::get_if<double>(&v.value))
                if (std::isfinite(*x)) largest = std::max(largest, std::abs(*x));
        // All zero (a single z(V) point's Δz): lengths read in nm, the others in the base unit.
        if (largest == 0 && c.reading_unit == "m") largest = 1e-9;
        const auto [f, prefix] = reading_prefix(largest, c.reading_unit == "m" ? 1e-12 : 1e-15);
        head.push_back({c.label + " [" + prefix + c.reading_unit + "]", c.width, c.left});
        factor.push_back(f);
    }
    std::vector<std::vector<std::string>> text;
    for (const T& row : rows) {
        std::vector<std::string>& line = text.emplace_back();
        for (const column<T>& c : columns) {
            if (!(c.shown & in_table)) continue;
            const double f = factor[line.size()];
            const double spread = c.spread ? c.spread(row) / f : std::numeric_limits<double>::quiet_NaN();
            line.push_back(table_text(scaled(c.get(row), f == 1.0 ? c.scale : divided_by(f)), c.number, c.none, spread));
        }
    }
    return render_table(head, text, layout);
}

template <class T, class Rows>
std::string format_csv(const std::vector<column<T>>& columns, const Rows& rows) {
    std::string out;
    for (const column<T>& c : columns) {
        if (!(c.shown & in_csv)) continue;
        if (!out.empty()) out += ',';
        out += csv_quote(c.key);
    }
    out += '\n';
    for (const T& row : rows) {
        bool first = true;
        for (const column<T>& c : columns) {
            if (!(c.shown & in_csv)) continue;
            if (!first) out += ',';
            first = false;
            out += csv_text(scaled(c.get(row), c.scale));
        }
        out += '\n';
    }
    return out;
}

// One row as a JSON record.
template <class T>
record to_record(const std::vector<column<T>>& columns, const T& row) {
    record r;
    r.fields.reserve(columns.size());
    for (const column<T>& c : columns) {
        if (!(c.shown & in_json)) continue;
        cell v = scaled(c.get(row), c.scale);
        if (v.is_absent()) continue;
        if (c.key.empty()) {
            if (auto* inner = std::get_if<record>(&v.value))
                for (auto& [k, x] : inner->fields) r.set(k, std::move(x));
            continue;
        }
        r.set(c.key, std::move(v));
    }
    return r;
}

// Rows as a JSON list of records.
template <class T, class Rows>
cell to_records(const std::vector<column<T>>& columns, const Rows& rows) {
    cell::list out;
    for (const T& row : rows) out.emplace_back(to_record(columns, row));
    return out;
}

// A line of prose about one row: each "{key}" in `pattern` becomes that column's table text, e.g.
// "  {direction}: {usable_points} usable points".
template <class T>
std::string format_line(const std::vector<column<T>>& columns, const T& row, std::string_view pattern) {
    std::vector<std::pair<std::string, std::string>> values;
    for (const column<T>& c : columns) {
        const double spread = c.spread ? c.spread(row) : std::numeric_limits<double>::quiet_NaN();
        values.emplace_back(c.key, table_text(scaled(c.get(row), c.scale), c.number, c.none, spread));
    }
    return fill_pattern(pattern, values);
}

// The columns of a part of a row (its uncertainty, its model comparison) as columns of the row.
// part_of: const P& (const R&).
template <class R, class P, class F>
std::vector<column<R>> part_columns(const std::vector<column<P>>& part, F part_of) {
    std::vector<column<R>> out;
    for (const column<P>& c : part) {
        column<R> r{c.key, c.label, [g = c.get, part_of](const R& row) { return g(part_of(row)); }, c.scale, c.number,
                    c.shown, {}, c.none, c.width, c.left, c.reading_unit};
        if (c.spread) r.spread = [s = c.spread, part_of](const R& row) { return s(part_of(row)); };
        out.push_back(std::move(r));
    }
    return out;
}

// The columns with these keys, in the order of `keys`.
template <class T>
std::vector<column<T>> select_columns(const std::vector<column<T>>& all, std::initializer_list<std::string_view> keys) {
    std::vector<column<T>> out;
    for (std::string_view k : keys)
        for (const column<T>& c : all)
            if (c.key == k) out.push_back(c);
    return out;
}

}  // namespace tipgap
