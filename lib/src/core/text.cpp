#include "tipgap/core/text.hpp"

#include <fmt/format.h>

namespace tipgap {

std::string single_line(std::string_view text) {
    std::string out;
    out.reserve(text.size());
    for (char ch : text) {
        const auto b = static_cast<unsigned char>(ch);
        if (b < 0x20 || b == 0x7f) out += fmt::format("\\x{:02X}", b);
        else out += ch;
    }
    return out;
}

}  // namespace tipgap
