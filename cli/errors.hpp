#pragma once
// Turning every failure into one line on stderr and a documented exit code (README "Exit codes"):
//   tipgap: <kind>: <file>:<line>:<column>: <key>: <what was wrong>; expected <what was expected>
// kind is "error" (bad input, exit 3), "usage error" (bad command line, exit 2), "no answer" (a
// well-formed request without a solution, exit 4) or "internal error" (a bug, exit 70).
#include <CLI/CLI.hpp>
#include <exception>
#include <string>

#include "tipgap/core/error.hpp"

namespace tipgap::cli {

// Exit code of an internal error (a bug): EX_SOFTWARE of sysexits.h.
inline constexpr int internal_error_exit = 70;

// The one-line text of a command-line parse error, rewritten from CLI11's wording into the format
// above and naming the help command of the subcommand being parsed. Exposed for tests.
std::string usage_message(const CLI::App& app, const CLI::ParseError& e);

// Prints the line for each kind of failure and returns the exit code.
int report_parse_error(const CLI::App& app, const CLI::ParseError& e);
int report_error(const tipgap::error& e);
int report_internal_error(const std::string& what);

// Replaces line breaks and other control bytes so that a message is always exactly one line.
std::string one_line(std::string text);

}  // namespace tipgap::cli
