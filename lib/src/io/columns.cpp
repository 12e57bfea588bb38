// The one formatter of declared columns: table, CSV and JSON text.
#include "tipgap/io/columns.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <nlohmann/json.hpp>
#include <stdexcept>

namespace tipgap {

void record::set(const std::string& key, cell value) {
    for (auto& [k, v] : fields) {
        if (k == key) {
            v = std::move(value);
            return;
        }
    }
    fields.emplace_back(key, std::move(value));
}

cell scaled(const cell& c, const scaling& s) {
    if (const double* v = std::get_if<double>(&c.value)) return s(*v);
    return c;
}

std::string fill_pattern(std::string_view pattern, const std::vector<std::pair<std::string, std::string>>& values) {
    std::string out;
    std::size_t i = 0;
    while (i < pattern.size()) {
        const std::size_t open = pattern.find('{', i);
        const std::size_t close = open == std::string_view::npos ? open : pattern.find('}', open);
        if (close == std::string_view::npos) break;
        out.append(pattern.substr(i, open - i));
        const std::string_view key = pattern.substr(open + 1, close - open - 1);
        const auto it = std::find_if(values.begin(), values.end(), [&](const auto& v) { return v.first == key; });
        if (it == values.end()) throw std::logic_error("no column '" + std::string(key) + "' for the line pattern");
        out += it->second;
        i = close + 1;
    }
    out.append(pattern.substr(std::min(i, pattern.size())));
    return out;
}

namespace {

std::string joined(const std::vector<std::string>& items) {
    std::string out;
    for (const std::string& s : items) out += (out.empty() ? "" : "; ") + s;
    return out;
}

// Display width of UTF-8 text: one column per code point (lead bytes only).
std::size_t display_width(const std::string& s) {
    std::size_t n = 0;
    for (unsigned char c : s) n += (c & 0xC0) != 0x80;
    return n;
}

std::string fixed_text(double v, int decimals) { return fmt::format("{:.{}f}", v, decimals); }

}  // namespace

std::string csv_quote(const std::string& s) {
    if (s.find_first_of(",\"\n\r") == std::string::npos) return s;
    std::string out = "\"";
    for (char c : s) {
        if (c == '"') out += '"';
        out += c;
    }
    return out + '"';
}

std::string significant(double v, int digits) {
    if (std::isnan(v)) return "NaN";
    if (v == 0.0) return "0";
    const double a = std::abs(v);
    if (a >= 1e-3 && a < 1e6) {
        const int decimals = std::max(0, digits - 1 - static_cast<int>(std::floor(std::log10(a))));
        return fmt::format("{:.{}f}", v, decimals);
    }
    return fmt::format("{:.{}e}", v, digits - 1);
}

namespace {
// The power of ten of the second significant digit of u > 0 after rounding u to two digits
// (0.0123 -> -3; 9.96 -> rounds to 10 -> 0).
int second_digit_place(double u) {
    int e = static_cast<int>(std::floor(std::log10(u)));
    if (std::round(u / std::pow(10.0, e - 1)) >= 100) ++e;
    return e - 1;
}
}  // namespace

std::string with_uncertainty(double v, double u) {
    if (!(std::isfinite(u) && u > 0) || !std::isfinite(v)) {
        std::string s = significant(v, 4);
        return u == 0.0 ? s + " ± 0" : s;
    }
    const int place = second_digit_place(u);  // u and v are rounded to 10^place
    const double unit = std::pow(10.0, place);
    const double ur = std::round(u / unit) * unit, vr = std::round(v / unit) * unit;
    const double largest = std::max(std::abs(vr), ur);
    // Fixed notation unless the numbers are very small or large (a tiny error on an ordinary
    // value, as on noise-free data, keeps the value readable: "10.0000000000 ± 0.0000000016").
    if (largest < 1e7 && (place >= -6 || (largest >= 1e-3 && place >= -15)))
        return fmt::format("{:.{}f} ± {:.{}f}", vr, std::max(0, -place), ur, std::max(0, -place));
    // Very small or large: a shared power of ten.
    const int p = static_cast<int>(std::floor(std::log10(largest)));
    const double scale = std::pow(10.0, p);
    const int decimals = std::max(0, p - place);
    return fmt::format("({:.{}f} ± {:.{}f})e{:+03d}", vr / scale, decimals, ur / scale, decimals, p);
}

std::string interval_text(double lo, double hi) {
    const double half = 0.5 * std::abs(hi - lo);
    if (!(std::isfinite(lo) && std::isfinite(hi) && half > 0) || std::max(std::abs(lo), std::abs(hi)) >= 1e7)
        return significant(lo, 4) + " – " + significant(hi, 4);
    // The ends to the place of two significant digits of the half width (at most 15 decimals).
    const int decimals = std::clamp(-second_digit_place(half), 0, 15);
    return fmt::format("{:.{}f} – {:.{}f}", lo, decimals, hi, decimals);
}

std::pair<double, std::string> reading_prefix(double largest, double smallest) {
    static const std::pair<double, const char*> prefixes[] = {{1e-15, "f"}, {1e-12, "p"}, {1e-9, "n"}, {1e-6, "µ"},
                                                              {1e-3, "m"},  {1.0, ""},    {1e3, "k"},  {1e6, "M"},
                                                              {1e9, "G"}};
    if (!(std::isfinite(largest) && largest > 0)) return {1.0, ""};
    std::pair<double, std::string> out{0.0, ""};
    for (const auto& [f, p] : prefixes)
        if (f >= smallest * (1 - 1e-12) && (out.first == 0.0 || largest >= f * (1 - 1e-12))) out = {f, p};
    return out;
}

std::string csv_text(const cell& c) {
    return std::visit(
        [](const auto& v) -> std::string {
            using V = std::decay_t<decltype(v)>;
            if constexpr (std::is_same_v<V, double>) {
                return std::isnan(v) ? std::string("nan") : fmt::format("{:.17g}", v);
            } else if constexpr (std::is_same_v<V, std::int64_t> || std::is_same_v<V, std::uint64_t>) {
                return fmt::format("{}", v);
            } else if constexpr (std::is_same_v<V, bool>) {
                return v ? "yes" : "no";
            } else if constexpr (std::is_same_v<V, std::string>) {
                return csv_quote(v);
            } else if constexpr (std::is_same_v<V, std::vector<std::string>>) {
                return csv_quote(joined(v));
            } else {
                return {};
            }
        },
        c.value);
}

std::string table_text(const cell& c, const table_number& n, const std::string& none, double spread) {
    return std::visit(
        [&](const auto& v) -> std::string {
            using V = std::decay_t<decltype(v)>;
            if constexpr (std::is_same_v<V, double>) {
                const bool fix = n.style == number_style::fixed;
                // With a spread: two significant digits of it, the value rounded to match.
                if (!std::isnan(spread) && spread != 0.0) return with_uncertainty(v, spread);
                std::string s = fix ? fixed_text(v, n.digits) : significant(v, n.digits);
                if (spread == 0.0) s += " ± 0";
                return s;
            } else if constexpr (std::is_same_v<V, std::int64_t> || std::is_same_v<V, std::uint64_t>) {
                return fmt::format("{}", v);
            } else if constexpr (std::is_same_v<V, bool>) {
                return v ? "yes" : "no";
            } else if constexpr (std::is_same_v<V, std::string>) {
                return v;
            } else if constexpr (std::is_same_v<V, std::vector<std::string>>) {
                return joined(v);
            } else {
                return none;
            }
        },
        c.value);
}

std::string render_table(const std::vector<table_column_format>& columns,
                         const std::vector<std::vector<std::string>>& rows, const table_layout& layout) {
    std::vector<std::size_t> width(columns.size());
    for (std::size_t i = 0; i < columns.size(); ++i) {
        if (columns[i].width > 0) {
            width[i] = static_cast<std::size_t>(columns[i].width);
            continue;
        }
        width[i] = display_width(columns[i].label);
        for (const auto& r : rows) width[i] = std::max(width[i], display_width(r[i]));
    }
    auto line = [&](auto&& text_of) {
        std::string out;
        for (std::size_t i = 0; i < columns.size(); ++i) {
            const std::string& s = text_of(i);
            const std::size_t w = display_width(s);
            const std::string pad(width[i] > w ? width[i] - w : 0, ' ');
            if (i) out += "  ";
            out += columns[i].left ? s + pad : pad + s;
        }
        return out + "\n";
    };
    std::string out = line([&](std::size_t i) -> const std::string& { return columns[i].label; });
    if (layout.rule) {
        std::size_t total = 0;
        for (std::size_t w : width) total += w + 2;
        out += std::string(total > 2 ? total - 2 : 0, '-') + "\n";
    }
    for (const auto& r : rows) out += line([&](std::size_t i) -> const std::string& { return r[i]; });
    return out;
}

namespace {

nlohmann::ordered_json to_json(const cell& c, bool sort_keys) {
    return std::visit(
        [&](const auto& v) -> nlohmann::ordered_json {
            using V = std::decay_t<decltype(v)>;
            if constexpr (std::is_same_v<V, std::monostate> || std::is_same_v<V, absent>) {
                return nullptr;
            } else if constexpr (std::is_same_v<V, cell::list>) {
                nlohmann::ordered_json a = nlohmann::ordered_json::array();
                for (const cell& x : v) a.push_back(to_json(x, sort_keys));
                return a;
            } else if constexpr (std::is_same_v<V, record>) {
                std::vector<const std::pair<std::string, cell>*> fields;
                for (const auto& f : v.fields)
                    if (!f.second.is_absent()) fields.push_back(&f);
                if (sort_keys || v.sorted_keys)
                    std::stable_sort(fields.begin(), fields.end(), [](auto* a, auto* b) { return a->first < b->first; });
                nlohmann::ordered_json o = nlohmann::ordered_json::object();
                for (const auto* f : fields) o[f->first] = to_json(f->second, sort_keys || v.sorted_keys);
                return o;
            } else {
                return v;
            }
        },
        c.value);
}

}  // namespace

std::string json_text(const cell& document, bool sort_keys) {
    nlohmann::ordered_json j = to_json(document, sort_keys);
    try {
        return j.dump(2) + "\n";
    } catch (const nlohmann::json::type_error&) {
        // Invalid UTF-8 in a file name, label or metadata value: each bad byte becomes U+FFFD and
        // the document says so, so that the JSON stays valid and the change is not silent.
        if (j.is_object()) j["invalid_utf8_replaced"] = true;
        return j.dump(2, ' ', false, nlohmann::json::error_handler_t::replace) + "\n";
    }
}

}  // namespace tipgap
