// The header-row and metadata reader shared by the curve and grid readers; see csv_header.hpp.
#include "io/detail/csv_header.hpp"

#include <cctype>
#include <cmath>
#include <fmt/format.h>

#include "tipgap/core/limits.hpp"

namespace tipgap::detail {

bool iequals(std::string_view a, std::string_view b) {
    if (a.size() != b.size()) return false;
    for (std::size_t i = 0; i < a.size(); ++i) {
        if (std::tolower(static_cast<unsigned char>(a[i])) != std::tolower(static_cast<unsigned char>(b[i])))
            return false;
    }
    return true;
}

void split_header_cell(std::string_view cell, std::string_view& name, std::string_view& unit, bool& has_unit) {
    cell = trim_cell(cell);
    std::size_t open = cell.find('['), close = cell.rfind(']');
    if (open == std::string_view::npos || close == std::string_view::npos || close < open) {
        // "name (unit)": the last parenthesis at the end of the cell; "name/unit": the last slash.
        close = !cell.empty() && cell.back() == ')' ? cell.size() - 1 : std::string_view::npos;
        open = close != std::string_view::npos ? cell.rfind('(') : std::string_view::npos;
        if (open == std::string_view::npos) {
            const std::size_t slash = cell.rfind('/');
            open = slash != std::string_view::npos && slash > 0 && slash + 1 < cell.size() ? slash : std::string_view::npos;
            close = cell.size();
        }
    }
    has_unit = open != std::string_view::npos;
    name = trim_cell(has_unit ? cell.substr(0, open) : cell);
    unit = has_unit ? trim_cell(cell.substr(open + 1, close - open - 1)) : std::string_view{};
}

double unit_factor(std::string_view unit, dimension d, std::string_view cell, const location& where) {
    try {
        return parse_quantity(fmt::format("1 {}", unit), d, where);
    } catch (const error&) {
        throw_input(where, fmt::format("unknown unit {} in {}; expected {} in {}", quote_input(unit, 20), quote_input(cell), dimension_phrase(d),
                                       accepted_units(d)));
    }
}

bool column_index(std::string_view spec, int& index) {
    spec = trim_cell(spec);
    if (spec.empty() || spec.size() > 9) return false;
    for (char c : spec)
        if (c < '0' || c > '9') return false;
    index = std::stoi(std::string(spec));
    return true;
}

bool same_column_spec(std::string_view a, std::string_view b) {
    int ia = 0, ib = 0;
    const bool a_index = column_index(a, ia), b_index = column_index(b, ib);
    if (a_index || b_index) return a_index && b_index && ia == ib;
    std::string_view na, nb, unit;
    bool has = false;
    split_header_cell(a, na, unit, has);
    split_header_cell(b, nb, unit, has);
    return iequals(na, nb);
}

namespace {

bool is_known_metadata_key(std::string_view key) {
    for (std::string_view k : {"bias", "temperature", "setpoint_current", "x", "y", "sample", "tip"})
        if (key == k) return true;
    return false;
}

// A metadata number passes the same kind of range check as the config's value (model.cpp): a
// file's "# bias: 1e300 V" is refused, not carried into a fit as inf.
double metadata_value(const std::string& text, dimension d, const location& where, double max_abs, const char* expected) {
    const double v = parse_quantity(text, d, where);
    if (!at_most(std::abs(v), max_abs)) throw_input(where, fmt::format("{} is out of range; expected {}", quote_input(text), expected));
    return v;
}

}  // namespace

void parse_metadata_line(std::string_view line, int line_number, const std::string& file, curve_metadata& meta,
                         bool decimal_comma) {
    std::string_view body = trim_cell(line.substr(line.find('#') + 1));
    std::size_t colon = body.find(':');
    if (colon == std::string_view::npos) return;  // a plain comment
    std::string_view key = trim_cell(body.substr(0, colon));
    std::string_view value = trim_cell(body.substr(colon + 1));
    if (key.empty()) return;
    // Column of the value, for messages about a bad value of a known key.
    int value_column = static_cast<int>(value.data() - line.data()) + 1;
    location where{file, line_number, value_column, std::string(key)};
    if (is_known_metadata_key(key) && meta.find(key) != nullptr)
        throw_input(where, "the key is given twice in the metadata; expected each of bias, temperature, setpoint_current, x, "
                           "y, sample and tip at most once");
    meta.entries.emplace_back(std::string(key), std::string(value));
    // A file written with decimal commas writes its metadata so too: "0,1 V".
    std::string number(value);
    if (decimal_comma && number.find('.') == std::string::npos && number.find(',') == number.rfind(',') &&
        number.find(',') != std::string::npos) {
        number[number.find(',')] = '.';
    }
    if (key == "bias") {
        meta.bias_V = metadata_value(number, dimension::voltage, where, 100.0, "a bias within ±100 V");
    } else if (key == "temperature") {
        meta.temperature_K = metadata_value(number, dimension::temperature, where, 2000.0, "a temperature in [0, 2000] K");
        if (*meta.temperature_K < 0) throw_input(where, "a temperature below 0 K; expected a temperature in [0, 2000] K");
    } else if (key == "setpoint_current") {
        meta.setpoint_current_A = metadata_value(number, dimension::current, where, 1e-3, "a current within ±1 mA");
    } else if (key == "x") {
        meta.x_m = metadata_value(number, dimension::length, where, 1e-3, "a position within ±1 mm");
    } else if (key == "y") {
        meta.y_m = metadata_value(number, dimension::length, where, 1e-3, "a position within ±1 mm");
    } else if (key == "sample") {
        meta.sample = std::string(value);
    } else if (key == "tip") {
        meta.tip = std::string(value);
    }
}

namespace {

// One override: the value given wins; a note when the file states another.
void override_value(std::optional<double>& in_file, double given, const curve_metadata& meta, const char* key,
                    const char* unit, std::vector<std::string>& notes) {
    // Equal to the printed precision of a metadata value: no note for "100 mV" against 0.1 V.
    constexpr double same_value = 1e-9;
    if (in_file && std::abs(*in_file - given) > same_value * std::abs(given)) {
        const std::string* written = meta.find(key);
        notes.push_back(fmt::format("the file states {} {}; the given {:g} {} is used instead", key,
                                    written ? *written : fmt::format("{:g} {}", *in_file, unit), given, unit));
    }
    in_file = given;
}

}  // namespace

void apply_overrides(const reader_options& o, curve_metadata& meta, std::vector<std::string>& notes) {
    if (o.bias_V) override_value(meta.bias_V, *o.bias_V, meta, "bias", "V", notes);
    if (o.temperature_K) override_value(meta.temperature_K, *o.temperature_K, meta, "temperature", "K", notes);
}

column_choice choice_of(const reader_options& o, std::vector<std::string> units) {
    column_choice c;
    c.specs = o.columns;
    c.units = std::move(units);
    if (o.delimiter != delimiter_choice::detect) {
        csv_dialect d;
        d.delimiter = o.delimiter == delimiter_choice::comma ? ',' : o.delimiter == delimiter_choice::tab ? '\t'
                      : o.delimiter == delimiter_choice::semicolon ? ';' : ' ';
        d.decimal_comma = d.delimiter != ',';
        c.dialect = d;
    }
    return c;
}

int csv_header::find(int rule) const {
    for (std::size_t c = 0; c < columns.size(); ++c) {
        if (columns[c].rule == rule) return static_cast<int>(c);
    }
    return -1;
}

std::string csv_header::describe() const {
    return present ? fmt::format("the header on line {}", line) : fmt::format("the first row (line {})", line + 1);
}

}  // namespace tipgap::detail
