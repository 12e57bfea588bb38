#include "tipgap/core/units.hpp"

#include <array>
#include <cctype>
#include <charconv>
#include <cmath>
#include <fmt/format.h>

namespace tipgap {
namespace {

struct unit_entry {
    std::string_view name;
    double factor;  // SI per unit
};

// Accepted spellings per dimension. "µ" appears both as U+00B5 and U+03BC; "u" is the ASCII form.
constexpr unit_entry length_units[] = {{"m", 1.0}, {"cm", 1e-2}, {"mm", 1e-3}, {"um", 1e-6}, {"µm", 1e-6},
                                  {"μm", 1e-6}, {"nm", 1e-9}, {"Å", 1e-10}, {"A", 1e-10}, {"pm", 1e-12}};
constexpr unit_entry energy_units[] = {{"eV", si::electron_volt}, {"meV", si::millielectron_volt},
                                  {"keV", si::electron_volt * 1e3}, {"J", 1.0}};
constexpr unit_entry voltage_units[] = {{"V", 1.0}, {"mV", 1e-3}, {"uV", 1e-6}, {"µV", 1e-6},
                                   {"μV", 1e-6}, {"kV", 1e3}};
constexpr unit_entry current_units[] = {{"A", 1.0}, {"mA", 1e-3}, {"uA", 1e-6}, {"µA", 1e-6}, {"μA", 1e-6},
                                   {"nA", 1e-9}, {"pA", 1e-12}, {"fA", 1e-15}};
constexpr unit_entry temperature_units[] = {{"K", 1.0}, {"mK", 1e-3}};
constexpr unit_entry area_units[] = {{"m^2", 1.0}, {"um^2", 1e-12}, {"µm^2", 1e-12}, {"nm^2", 1e-18},
                                {"Å^2", 1e-20}, {"A^2", 1e-20}, {"pm^2", 1e-24}, {"m²", 1.0}, {"nm²", 1e-18},
                                {"Å²", 1e-20}};
constexpr unit_entry resistance_units[] = {{"Ohm", 1.0}, {"ohm", 1.0}, {"Ω", 1.0}, {"kOhm", 1e3},
                                      {"kΩ", 1e3}, {"MOhm", 1e6}, {"MΩ", 1e6}, {"GOhm", 1e9}, {"GΩ", 1e9}};
constexpr unit_entry conductance_units[] = {{"S", 1.0}, {"mS", 1e-3}, {"uS", 1e-6}, {"µS", 1e-6},
                                       {"nS", 1e-9}, {"pS", 1e-12},
                                       {"G0", si::conductance_quantum}};

template <std::size_t N>
bool lookup(const unit_entry (&table)[N], std::string_view unit, double& factor) {
    for (const auto& e : table) {
        if (e.name == unit) {
            factor = e.factor;
            return true;
        }
    }
    return false;
}

bool unit_factor(dimension d, std::string_view unit, double& factor) {
    switch (d) {
        case dimension::length: return lookup(length_units, unit, factor);
        case dimension::energy: return lookup(energy_units, unit, factor);
        case dimension::voltage: return lookup(voltage_units, unit, factor);
        case dimension::current: return lookup(current_units, unit, factor);
        case dimension::temperature: return lookup(temperature_units, unit, factor);
        case dimension::area: return lookup(area_units, unit, factor);
        case dimension::resistance: return lookup(resistance_units, unit, factor);
        case dimension::conductance: return lookup(conductance_units, unit, factor);
        case dimension::dimensionless: factor = 1.0; return unit.empty();
    }
    return false;
}

std::string_view trim(std::string_view s) {
    while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
    while (!s.empty() && (s.back() == ' ' || s.back() == '\t' || s.back() == '\r')) s.remove_suffix(1);
    return s;
}

// Splits "<number><spaces><unit>" at the end of the number.
void split_number(std::string_view s, std::string_view& number, std::string_view& rest) {
    std::size_t i = 0;
    if (i < s.size() && (s[i] == '+' || s[i] == '-')) ++i;
    while (i < s.size()) {
        char c = s[i];
        bool digit = (c >= '0' && c <= '9') || c == '.';
        bool exp = (c == 'e' || c == 'E') && i + 1 < s.size() &&
                   ((s[i + 1] >= '0' && s[i + 1] <= '9') || s[i + 1] == '+' || s[i + 1] == '-');
        if (digit) {
            ++i;
        } else if (exp) {
            i += 2;
        } else {
            break;
        }
    }
    // "inf"/"nan" words are numbers to from_chars; catch them so the message is about finiteness.
    if (i == 0 || (i == 1 && (s[0] == '+' || s[0] == '-'))) {
        std::size_t j = i;
        while (j < s.size() && std::isalpha(static_cast<unsigned char>(s[j]))) ++j;
        std::string_view word = s.substr(i, j - i);
        if (word == "inf" || word == "nan" || word == "NaN" || word == "Inf" || word == "infinity") i = j;
    }
    number = s.substr(0, i);
    rest = trim(s.substr(i));
}

}  // namespace

const char* dimension_name(dimension d) {
    switch (d) {
        case dimension::length: return "length";
        case dimension::energy: return "energy";
        case dimension::voltage: return "voltage";
        case dimension::current: return "current";
        case dimension::temperature: return "temperature";
        case dimension::area: return "area";
        case dimension::resistance: return "resistance";
        case dimension::conductance: return "conductance";
        case dimension::dimensionless: return "plain number";
    }
    return "?";
}

const char* dimension_phrase(dimension d) {
    switch (d) {
        case dimension::energy: return "an energy";
        case dimension::area: return "an area";
        case dimension::dimensionless: return "a plain number";
        default: break;
    }
    static thread_local std::string buf;
    buf = std::string("a ") + dimension_name(d);
    return buf.c_str();
}

const char* accepted_units(dimension d) {
    switch (d) {
        case dimension::length: return "m, cm, mm, um, nm, Å (or A), pm";
        case dimension::energy: return "eV, meV, keV, J";
        case dimension::voltage: return "V, mV, uV, kV";
        case dimension::current: return "A, mA, uA, nA, pA, fA";
        case dimension::temperature: return "K, mK";
        case dimension::area: return "m^2, um^2, nm^2, Å^2 (or A^2), pm^2";
        case dimension::resistance: return "Ohm, kOhm, MOhm, GOhm";
        case dimension::conductance: return "S, mS, uS, nS, pS, G0";
        case dimension::dimensionless: return "no unit";
    }
    return "?";
}

double parse_number(std::string_view text, const location& where) {
    std::string_view s = trim(text);
    if (!s.empty() && s.front() == '+') s.remove_prefix(1);
    double v = 0.0;
    auto [ptr, ec] = std::from_chars(s.data(), s.data() + s.size(), v);
    if (!s.empty() && ec == std::errc::result_out_of_range && ptr == s.data() + s.size()) {
        throw_input(where, fmt::format("{} is outside the range of a double-precision number; expected a "
                                       "magnitude of 0 or between about 1e-308 and 1e308",
                                       quote_input(trim(text))));
    }
    if (s.empty() || ec != std::errc() || ptr != s.data() + s.size()) {
        throw_input(where, fmt::format("{} is not a number", quote_input(trim(text))));
    }
    if (!std::isfinite(v)) {
        throw_input(where, fmt::format("{} is not a finite number; expected a finite value", quote_input(trim(text))));
    }
    return v;
}

namespace {

// Characters that look like the ASCII or usual ones and are accepted as them: KELVIN SIGN,
// ANGSTROM SIGN, OHM SIGN, MINUS SIGN, and the no-break, narrow no-break and thin spaces that
// word processors put between a number and its unit. (U+00B5 and U+03BC are both in the tables.)
struct lookalike {
    std::string_view from, to;
};
constexpr lookalike lookalikes[] = {{"\u212A", "K"}, {"\u212B", "Å"}, {"\u2126", "Ω"}, {"\u2212", "-"},
                                    {"\u00A0", " "}, {"\u202F", " "}, {"\u2009", " "}};

std::string without_lookalikes(std::string_view text) {
    std::string out(text);
    for (const lookalike& l : lookalikes)
        for (std::size_t at = out.find(l.from); at != std::string::npos; at = out.find(l.from, at + l.to.size()))
            out.replace(at, l.from.size(), l.to);
    return out;
}

// " (it holds U+2103, which is not a unit letter tipgap knows)" for the first non-ASCII character
// of a unit that was not found, or "".
std::string first_unusual_character(std::string_view unit) {
    for (std::size_t i = 0; i < unit.size(); ++i) {
        const auto b = static_cast<unsigned char>(unit[i]);
        if (b < 0x80) continue;
        char32_t cp = 0;
        int n = b >= 0xF0 ? 3 : b >= 0xE0 ? 2 : b >= 0xC0 ? 1 : 0;
        cp = n == 3 ? b & 0x07u : n == 2 ? b & 0x0Fu : n == 1 ? b & 0x1Fu : b;
        for (int k = 1; k <= n && i + static_cast<std::size_t>(k) < unit.size(); ++k)
            cp = (cp << 6) | (static_cast<unsigned char>(unit[i + static_cast<std::size_t>(k)]) & 0x3Fu);
        if (cp == 0xB5 || cp == 0x3BC || cp == 0xC5 || cp == 0x3A9 || cp == 0xB2) continue;  // µ, μ, Å, Ω, ²: known
        return fmt::format(" (it holds U+{:04X}, a character that only looks like a unit letter; type the unit in ASCII)",
                           static_cast<unsigned>(cp));
    }
    return "";
}

}  // namespace

double parse_quantity(std::string_view text, dimension d, const location& where) {
    const std::string plain = without_lookalikes(text);
    std::string_view s = trim(plain);
    if (s.empty()) {
        throw_input(where, fmt::format("empty value; expected {} ({})", dimension_phrase(d), accepted_units(d)));
    }
    std::string_view number, unit;
    split_number(s, number, unit);
    if (number.empty()) {
        throw_input(where, fmt::format("{} does not start with a number; expected {} such as '{}'",
                                       quote_input(s), dimension_phrase(d),
                                       d == dimension::length ? "0.6 nm" : d == dimension::voltage ? "100 mV"
                                       : d == dimension::current ? "1 nA" : d == dimension::energy ? "4.5 eV"
                                       : d == dimension::temperature ? "4.2 K" : d == dimension::area ? "1 nm^2"
                                       : "1"));
    }
    double v = parse_number(number, where);
    if (unit.empty() && d != dimension::dimensionless) {
        throw_input(where, fmt::format("{} has no unit; expected {} in {}", quote_input(s), dimension_phrase(d),
                                       accepted_units(d)));
    }
    double factor = 1.0;
    if (d == dimension::dimensionless && !unit.empty()) {
        throw_input(where, fmt::format("{} has a unit; expected a plain number without a unit", quote_input(s)));
    }
    if (!unit_factor(d, unit, factor)) {
        throw_input(where, fmt::format("unknown unit {} in {}; expected {} in {}{}", quote_input(unit, 20),
                                       quote_input(s), dimension_phrase(d), accepted_units(d), first_unusual_character(unit)));
    }
    // "1e308 kV" is a finite number times a finite factor, but not a finite voltage.
    const double si_value = v * factor;
    if (!std::isfinite(si_value)) {
        throw_input(where, fmt::format("{} is too large; expected a finite {}", quote_input(s), dimension_name(d)));
    }
    return si_value;
}

uncertain parse_uncertain(std::string_view text, dimension d, const location& where) {
    std::string_view s = trim(text);
    std::size_t pm = s.find("±");
    std::size_t pm_len = 2;  // UTF-8 length of ±
    if (pm == std::string_view::npos) {
        pm = s.find("+-");
        pm_len = 2;
    }
    if (pm == std::string_view::npos) return {parse_quantity(s, d, where), 0.0};
    std::string_view left = trim(s.substr(0, pm));
    std::string_view right = trim(s.substr(pm + pm_len));
    if (left.empty() || right.empty()) {
        throw_input(where, fmt::format("{} needs a value on both sides of the '±'; expected {} such as '4.5 ± 0.1 eV'",
                                       quote_input(s), dimension_phrase(d)));
    }
    std::string_view rnum, runit;
    split_number(right, rnum, runit);
    std::string_view lnum, lunit;
    split_number(left, lnum, lunit);
    // "4.5 ± 0.2 eV": the unit after the uncertainty applies to both.
    std::string unit_text = std::string(lunit.empty() ? runit : lunit);
    uncertain u;
    u.value = parse_quantity(std::string(lnum) + " " + unit_text, d, where);
    u.sigma = parse_quantity(std::string(rnum) + " " + std::string(runit.empty() ? lunit : runit), d, where);
    if (u.sigma < 0) {
        throw_input(where, fmt::format("the uncertainty in {} is negative; expected a standard uncertainty >= 0",
                                       quote_input(s)));
    }
    return u;
}

}  // namespace tipgap
