// name_for: a scope's own row wins over the row for every scope; unknown keys have no name.
#include <gtest/gtest.h>

#include "tipgap/core/key_names.hpp"

using namespace tipgap;

TEST(key_names, own_scope_first_then_every_scope) {
    constexpr key_name table[] = {
        {"", "samples", "--mc-samples"},
        {"table", "samples", "--samples"},
        {"", "gap", "--gap"},
        {"synth", "current_noise_A", "--noise"},
    };
    EXPECT_EQ(name_for(table, "table", "samples"), "--samples");  // listed after the general row
    EXPECT_EQ(name_for(table, "plan", "samples"), "--mc-samples");
    EXPECT_EQ(name_for(table, "synth", "gap"), "--gap");
    EXPECT_EQ(name_for(table, "fit", "current_noise_A"), "");  // only synth names it
    EXPECT_EQ(name_for(table, "", "bias"), "");
    EXPECT_EQ(name_for({}, "plan", "gap"), "");
}
