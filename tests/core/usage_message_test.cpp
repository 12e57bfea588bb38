// usage_message: CLI11 2.1's parse-error wordings (as its exceptions spell them) rewritten into
// tipgap's one-line form. The expected lines are those tests/bad_inputs/cases.tsv checks end to end.
#include <gtest/gtest.h>

#include <string>

#include "tipgap/core/usage_message.hpp"

using namespace tipgap;

namespace {

usage_context predict_context() {
    return {"tipgap predict", "predict, plan", {},
            [](const std::string& name) { return name == "files" ? std::string("FILE...") : name + " VALUE"; }};
}

}  // namespace

TEST(usage_message, names_the_missing_or_unknown_command) {
    usage_context c = predict_context();
    c.command = "tipgap";
    EXPECT_EQ(usage_message("A subcommand is required", c),
              "no command given; expected one of: predict, plan (see 'tipgap --help')");
    c.remaining = {"bogus", "--x"};
    EXPECT_EQ(usage_message("A subcommand is required", c),
              "'bogus' is not a command; expected one of: predict, plan (see 'tipgap --help')");
}

TEST(usage_message, rewrites_missing_options_and_values) {
    const usage_context c = predict_context();
    EXPECT_EQ(usage_message("--gap is required", c), "--gap: missing; expected --gap VALUE (see 'tipgap predict --help')");
    EXPECT_EQ(usage_message("files is required", c), "files: missing; expected FILE... (see 'tipgap predict --help')");
    EXPECT_EQ(usage_message("--gap: 1 required TEXT missing", c),
              "--gap: the value is missing; expected --gap VALUE (see 'tipgap predict --help')");
}

TEST(usage_message, rewrites_ranges_and_bad_numbers) {
    const usage_context c = predict_context();
    EXPECT_EQ(usage_message("--points: Value 1 not in range 2 to 1000000", c),
              "--points: '1' is not allowed; expected a number from 2 to 1000000 (see 'tipgap predict --help')");
    EXPECT_EQ(usage_message("Could not convert: --confidence = abc", c),
              "--confidence: 'abc' is not a valid value; expected a number (see 'tipgap predict --help')");
    EXPECT_EQ(usage_message("The value abc is not an allowed value for --confidence", c),
              "--confidence: 'abc' is not a valid value; expected a number (see 'tipgap predict --help')");
}

TEST(usage_message, puts_unexpected_arguments_back_in_command_line_order) {
    const usage_context c = predict_context();
    // CLI11 lists the extra arguments last first.
    EXPECT_EQ(usage_message("The following arguments were not expected: red --colour", c),
              "'--colour red' not understood; expected only the options and arguments listed by 'tipgap predict --help'");
    EXPECT_EQ(usage_message("The following argument was not expected: x", c),
              "'x' not understood; expected only the options and arguments listed by 'tipgap predict --help'");
}

TEST(usage_message, keeps_unknown_wording_and_adds_the_help_hint) {
    const usage_context c = predict_context();
    EXPECT_EQ(usage_message("something odd happened", c), "something odd happened (see 'tipgap predict --help')");
    // "name: rest" that matches no pattern is kept as it is.
    EXPECT_EQ(usage_message("--gap: Value x odd", c), "--gap: Value x odd (see 'tipgap predict --help')");
}
