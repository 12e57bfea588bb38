// The one enum <-> name mechanism (tipgap/core/enum_names.hpp): every name reads back to its
// value, the lists in messages are exactly the accepted names, output-only names are refused, and
// only the sweep direction ignores letter case. The names are the file and command-line format,
// so they are checked word for word.
#include <gtest/gtest.h>

#include <string>

#include "tipgap/core/enum_names.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/grid/map.hpp"
#include "tipgap/io/curve_io.hpp"
#include "tipgap/model/current.hpp"
#include "tipgap/model/geometry.hpp"
#include "tipgap/model/model.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/synth/synth.hpp"

using namespace tipgap;

namespace {

// Every accepted name of E reads back to the value it was written from.
template <class E>
void expect_round_trip() {
    for (const auto& entry : enum_names<E>::table) {
        E back{};
        if (!entry.accepted) continue;
        ASSERT_TRUE(from_string(to_string(entry.value), back)) << entry.name;
        EXPECT_EQ(back, entry.value) << entry.name;
    }
}

}  // namespace

TEST(enum_names, every_name_reads_back_to_its_value) {
    expect_round_trip<image_kind>();
    expect_round_trip<method_kind>();
    expect_round_trip<geometry_kind>();
    expect_round_trip<regime>();
    expect_round_trip<fit_model>();
    expect_round_trip<contact_kind>();
    expect_round_trip<fit_status>();
    expect_round_trip<solve_status>();
    expect_round_trip<pixel_quality>();
    expect_round_trip<sweep_direction>();
    expect_round_trip<synth_sweeps>();
    expect_round_trip<grid_pattern>();
}

TEST(enum_names, names_as_written_in_files_and_output) {
    EXPECT_STREQ(to_string(image_kind::approximate), "approximate");
    EXPECT_STREQ(to_string(geometry_kind::contact_anchored), "contact_anchored");
    EXPECT_STREQ(to_string(regime::barrier_collapsed), "barrier_collapsed");
    EXPECT_STREQ(to_string(fit_status::not_converged), "not_converged");
    EXPECT_STREQ(to_string(solve_status::current_too_high), "current_too_high");
    EXPECT_STREQ(to_string(pixel_quality::too_few_points), "too_few_points");
    EXPECT_STREQ(to_string(sweep_direction::unknown), "unknown");
    EXPECT_STREQ(to_string(synth_sweeps::approach_retract), "approach_retract");
    EXPECT_STREQ(to_string(contact_kind::plateau), "plateau");
}

TEST(enum_names, message_lists_are_the_accepted_names_in_order) {
    EXPECT_EQ(accepted_names<image_kind>(), "exact, approximate or none");
    // Issue 12 added method: exact (the same message as the config reader and the Python module give).
    EXPECT_EQ(accepted_names<method_kind>(), "wkb, simmons or exact");
    EXPECT_EQ(accepted_names<geometry_kind>(), "planar, paraboloid or contact_anchored");
    EXPECT_EQ(accepted_names<fit_model>(), "linear or offset");
    EXPECT_EQ(accepted_names<synth_sweeps>(), "retract, approach or approach_retract");
    EXPECT_EQ(accepted_names<grid_pattern>(), "uniform or disc");
    EXPECT_EQ(accepted_names<sweep_direction>(), "approach or retract");
}

TEST(enum_names, unknown_text_and_output_only_names_are_refused) {
    image_kind k = image_kind::exact;
    EXPECT_FALSE(from_string("Exact", k));  // case matters for configuration names
    EXPECT_FALSE(from_string("", k));
    EXPECT_FALSE(from_string("exact ", k));
    EXPECT_EQ(k, image_kind::exact);  // untouched on failure
    sweep_direction d = sweep_direction::approach;
    EXPECT_FALSE(from_string("unknown", d));  // written in output, never read
    EXPECT_EQ(d, sweep_direction::approach);
}

// A curve file's direction column may be written in any letter case (tests/io/curve_io_test.cpp
// reads such a file); configuration names may not.
TEST(enum_names, sweep_direction_ignores_letter_case) {
    sweep_direction d = sweep_direction::unknown;
    ASSERT_TRUE(from_string("RETRACT", d));
    EXPECT_EQ(d, sweep_direction::retract);
    ASSERT_TRUE(from_string("Approach", d));
    EXPECT_EQ(d, sweep_direction::approach);
    EXPECT_FALSE(from_string("approaching", d));
}
