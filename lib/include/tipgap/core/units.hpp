#pragma once
// Quantities with units at the edges ("0.6 nm", "100 mV", "4.5 ± 0.2 eV"); SI doubles inside.
#include <string>
#include <string_view>

#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap {

// What a quantity measures; decides how a unit string is read ("A" is ångström for a length,
// ampere for a current).
enum class dimension { length, energy, voltage, current, temperature, area, resistance, conductance, dimensionless };

// "length", "energy", ... (for messages).
const char* dimension_name(dimension d);
// "a length", "an energy", ... (for messages).
const char* dimension_phrase(dimension d);
// The units accepted for a dimension, for messages: "m, nm, Å (or A), pm".
const char* accepted_units(dimension d);

// A value with its standard uncertainty (sigma = 0 when none was given). SI units.
struct uncertain {
    double value = 0.0;  // SI
    double sigma = 0.0;  // SI, >= 0
};

// Parses "<number> <unit>" into SI. The unit is required except for dimensionless values.
// Throws tipgap::error (input) naming `where` and the expected dimension on any mistake.
double parse_quantity(std::string_view text, dimension d, const location& where = {});

// Like parse_quantity, also accepting "<v> ± <u> <unit>", "<v> +- <u> <unit>" and
// "<v> <unit> ± <u> <unit>".
uncertain parse_uncertain(std::string_view text, dimension d, const location& where = {});

// Parses a plain floating-point number (std::from_chars); throws on trailing junk.
double parse_number(std::string_view text, const location& where = {});

// Unit conversions used at the edges.
inline constexpr double nm = 1e-9;
inline constexpr double angstrom = 1e-10;
inline constexpr double eV = si::electron_volt;

}  // namespace tipgap
