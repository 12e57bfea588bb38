#pragma once
// Enum <-> name, one mechanism for every enum that has names: the names used in YAML, on the
// command line, in file headers and in table/CSV/JSON output. Each such enum specialises
// enum_names<E> right after its declaration, with one table:
//
//   template <> struct enum_names<method_kind> {
//       static constexpr enum_name<method_kind> table[] = {{method_kind::wkb, "wkb"},
//                                                          {method_kind::simmons, "simmons"}};
//   };
//
// and to_string, from_string and accepted_names then work for it. The table's order is the order
// of the names in messages ("expected wkb or simmons"). An entry marked `accepted = false` is
// written but never read (a value the program reports, not one a user may choose). A specialisation
// may add `static constexpr bool ignore_case = true;` to read names without regard to ASCII case.
#include <cstddef>
#include <string>
#include <string_view>
#include <type_traits>

namespace tipgap {

template <class E>
struct enum_name {
    E value;
    const char* name;      // as written and read: lower case, words joined by '_'
    bool accepted = true;  // false: output only, from_string refuses it
};

// Specialised next to each named enum (see above); deliberately left undefined.
template <class E>
struct enum_names;

template <class E>
concept named_enum = std::is_enum_v<E> && requires { enum_names<E>::table; };

namespace detail {
constexpr bool same_name(std::string_view a, std::string_view b, bool ignore_case) {
    if (!ignore_case) return a == b;
    if (a.size() != b.size()) return false;
    auto lower = [](char c) { return c >= 'A' && c <= 'Z' ? static_cast<char>(c - 'A' + 'a') : c; };
    for (std::size_t i = 0; i < a.size(); ++i)
        if (lower(a[i]) != lower(b[i])) return false;
    return true;
}
template <class E>
constexpr bool ignores_case() {
    if constexpr (requires { enum_names<E>::ignore_case; })
        return enum_names<E>::ignore_case;
    else
        return false;
}
}  // namespace detail

// The name of e; "?" for a value outside the table (no valid enumerator is).
template <named_enum E>
constexpr const char* to_string(E e) {
    for (const auto& entry : enum_names<E>::table)
        if (entry.value == e) return entry.name;
    return "?";
}

// Reads an accepted name into `out`. Returns false, and leaves `out` alone, for any other text.
template <named_enum E>
constexpr bool from_string(std::string_view s, E& out) {
    for (const auto& entry : enum_names<E>::table) {
        if (entry.accepted && detail::same_name(s, entry.name, detail::ignores_case<E>())) {
            out = entry.value;
            return true;
        }
    }
    return false;
}

// The accepted names for messages, in table order: "exact, approximate or none".
template <named_enum E>
std::string accepted_names() {
    std::string out;
    std::size_t n = 0, total = 0;
    for (const auto& entry : enum_names<E>::table) total += entry.accepted ? 1 : 0;
    for (const auto& entry : enum_names<E>::table) {
        if (!entry.accepted) continue;
        if (n > 0) out += n + 1 == total ? " or " : ", ";
        out += entry.name;
        ++n;
    }
    return out;
}

}  // namespace tipgap
