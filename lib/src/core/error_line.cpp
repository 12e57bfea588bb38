#include "tipgap/core/error_line.hpp"

#include <exception>
#include <new>

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

failure current_failure() {
    std::string what;
    try {
        throw;
    } catch (const error& e) {
        return {error_line(e), static_cast<int>(e.kind())};
    } catch (const std::bad_alloc&) {
        what = "out of memory";
    } catch (const std::exception& e) {
        what = e.what();
    } catch (...) {
        what = "an exception that is not a std::exception";
    }
    return {"tipgap: internal error (this is a bug; please report it with the command line): " + one_line(what)};
}

}  // namespace tipgap
