#include "tipgap/core/error_line.hpp"

namespace tipgap {

const char* error_label(error_kind kind) {
    switch (kind) {
        case error_kind::usage: return "usage error";
        case error_kind::no_answer: return "no answer";
        case error_kind::input: return "error";
    }
    return "error";
}

std::string one_line(std::string text) {
    for (char& ch : text) {
        auto u = static_cast<unsigned char>(ch);
        if (u < 0x20 || u == 0x7F) ch = ' ';
    }
    return text;
}

std::string error_line(const error& e) { return "tipgap: " + std::string(error_label(e.kind())) + ": " + one_line(e.what()); }

}  // namespace tipgap
