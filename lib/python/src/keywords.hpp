#pragma once
// The boundary between the library's checks and Python keywords, as cli/flags.hpp is for flags:
// the library validates once with neutral keys ("gap", "noise_floor_A", "tip.work_function"); this
// file maps each key to the keyword a Python caller wrote (gap_nm, noise_floor_A,
// tip_work_function_eV) in ONE table (keywords.cpp), so that tipgap.Error names what the caller can fix.
#include <string_view>

#include "tipgap/core/error.hpp"

namespace tipgap::python {

// The keyword of a library key in `function` ("predict", "fit", ...), or "" when none sets it.
std::string_view keyword_for(std::string_view function, std::string_view key);

// Called while handling `e`: throws it again naming the keyword, or unchanged.
[[noreturn]] void rethrow_naming_keyword(std::string_view function, const error& e);

// Runs f() and renames the key of a tipgap::error it throws.
template <class F>
decltype(auto) naming_keywords(std::string_view function, F&& f) {
    try {
        return f();
    } catch (const error& e) {
        rethrow_naming_keyword(function, e);
    }
}

}  // namespace tipgap::python
