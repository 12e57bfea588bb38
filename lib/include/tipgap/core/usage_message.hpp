#pragma once
// The one-line text of a command-line parse error: a parser's own wording (CLI11 2.1's, matched as
// plain text) rewritten into tipgap's form "<key>: <what was wrong>; expected <what was expected>
// (see '<command> --help')". Wording it does not know is kept, with the help hint appended.
#include <functional>
#include <string>
#include <vector>

namespace tipgap {

// What the parser knew about the command line it failed on.
struct usage_context {
    std::string command = "tipgap";      // "tipgap predict" inside a command, else "tipgap"
    std::string commands;                // the command names, comma-separated: "predict, plan, ..."
    std::vector<std::string> remaining;  // the arguments it did not consume, in order
    // How an option is written: "--gap VALUE", "--current CURRENT", or "FILE..." for a positional.
    std::function<std::string(const std::string& option)> option_usage;
};

// what: the parser's message, e.g. "--points: Value 1 not in range 2 to 1000000". Returns the
// message without the "tipgap: usage error: " prefix.
std::string usage_message(const std::string& what, const usage_context& c);

}  // namespace tipgap
