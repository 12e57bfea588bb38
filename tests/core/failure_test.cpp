// current_failure: the line and exit code main() reports for whatever a command threw
// (README "Exit codes": 2 usage, 3 input, 4 no answer, 70 internal error).
#include <gtest/gtest.h>

#include <new>
#include <stdexcept>
#include <string>

#include "tipgap/core/error.hpp"
#include "tipgap/core/error_line.hpp"

using namespace tipgap;

namespace {

template <class F>
failure failure_of(F&& f) {
    try {
        f();
    } catch (...) {
        return current_failure();
    }
    return {"nothing thrown", -1};
}

}  // namespace

TEST(current_failure, a_tipgap_error_keeps_its_line_and_kind) {
    const failure u = failure_of([] { throw_usage("--gap", "expected a length"); });
    EXPECT_EQ(u.exit_code, 2);
    EXPECT_EQ(u.line, "tipgap: usage error: --gap: expected a length");
    const failure i = failure_of([] { throw_input(location{"scan.csv", 4, 2, ""}, "not a number"); });
    EXPECT_EQ(i.exit_code, 3);
    EXPECT_EQ(i.line.rfind("tipgap: error: scan.csv:4:2: ", 0), 0u) << i.line;
}

TEST(current_failure, anything_else_is_an_internal_error_on_one_line) {
    const failure a = failure_of([] { throw std::bad_alloc(); });
    EXPECT_EQ(a.exit_code, 70);
    EXPECT_EQ(a.line, "tipgap: internal error (this is a bug; please report it with the command line): out of memory");
    const failure r = failure_of([] { throw std::runtime_error("bad\nstate"); });
    EXPECT_EQ(r.exit_code, 70);
    EXPECT_EQ(r.line, "tipgap: internal error (this is a bug; please report it with the command line): bad state");
    const failure n = failure_of([] { throw 42; });
    EXPECT_EQ(n.line, "tipgap: internal error (this is a bug; please report it with the command line): an exception "
                      "that is not a std::exception");
}
