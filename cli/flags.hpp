#pragma once
// The boundary between the library's checks and the command line. The library validates its
// options once, with neutral keys (the field names, "gap", "bias"); this file maps each key to
// its flag in ONE table (flags.cpp) and renames the errors, so that no check is written twice.
#include <string>
#include <string_view>

#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap::cli {

// The flag of a library key in `command`, or "" when no flag sets it.
std::string_view flag_for(std::string_view command, std::string_view key);

// What a renamed error becomes: a usage error (a flag's value broke an option's rule), or an
// error of its own kind (an operating point the model refuses, exit 3 as always).
enum class flag_error { usage, own_kind };

// Called while handling `e`: throws it again naming the flag, or unchanged when its key is no flag's.
[[noreturn]] void rethrow_naming_flag(std::string_view command, flag_error as, const error& e);

// Runs f() and renames the flag of a tipgap::error it throws.
template <class F>
decltype(auto) naming_flags(std::string_view command, flag_error as, F&& f) {
    try {
        return f();
    } catch (const error& e) {
        rethrow_naming_flag(command, as, e);
    }
}

// A flag value with a unit, e.g. "2pA", read by the library's unit parser; a bad value is a usage
// error naming `flag`.
double flag_quantity(const std::string& text, dimension d, const char* flag);

}  // namespace tipgap::cli
