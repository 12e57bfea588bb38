#pragma once
// Reading one measured current-distance curve I(z) per delimited text file.
//
// File layout (one curve per file):
//   # bias: 100 mV                    optional metadata, "# key: value" (values with units)
//   # setpoint_current: 1 nA
//   # a comment without a colon is ignored
//   z [nm],current [nA],direction     header: column names with units
//   0.00,1.02,approach                rows
// Columns: `z` (length: m, cm, mm, um, nm, Å or A, pm), `current` or `I` (A, mA, uA, nA, pA, fA)
// and an optional `direction` (approach | retract). Other columns are read past and ignored.
// Delimiters, unit spellings, other column names, header-less files, z orientation and a bias
// or temperature the file does not state: reader_options (tipgap/io/reader_options.hpp).
// z is the relative tip displacement, increasing as the tip retracts; its zero is arbitrary.
#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "tipgap/core/enum_names.hpp"
#include "tipgap/io/reader_options.hpp"

namespace tipgap {

enum class sweep_direction {
    approach,  // tip moving towards the sample (z decreasing)
    retract,   // tip moving away (z increasing)
    unknown,   // a single sweep that does not move monotonically
};

// "approach", "retract", "unknown" in JSON/CSV output; the direction column accepts "approach" and
// "retract" in any letter case.
template <>
struct enum_names<sweep_direction> {
    static constexpr bool ignore_case = true;
    static constexpr enum_name<sweep_direction> table[] = {{sweep_direction::approach, "approach"},
                                                           {sweep_direction::retract, "retract"},
                                                           {sweep_direction::unknown, "unknown", false}};
};

// The "# key: value" lines of a curve file. Known keys are also parsed into SI fields.
struct curve_metadata {
    std::vector<std::pair<std::string, std::string>> entries;  // every key/value as written, in order
    std::optional<double> bias_V;               // key `bias`, V
    std::optional<double> temperature_K;        // key `temperature`, K
    std::optional<double> setpoint_current_A;   // key `setpoint_current`, A
    std::optional<double> x_m;                  // key `x`, lateral position, m
    std::optional<double> y_m;                  // key `y`, lateral position, m
    std::string sample;                         // key `sample`, free text
    std::string tip;                            // key `tip`, free text

    // The value written for `key`, or nullptr.
    const std::string* find(std::string_view key) const;
};

// One monotonic sweep of a curve, in file order.
struct curve_sweep {
    sweep_direction direction = sweep_direction::unknown;
    std::vector<double> z_m;        // m
    std::vector<double> current_A;  // A, signed as measured
    std::size_t first_row = 0;      // index of the sweep's first row in measured_curve::z_m
};

struct measured_curve {
    std::string file;               // path as given
    curve_metadata metadata;
    std::vector<double> z_m;        // all rows, m
    std::vector<double> current_A;  // all rows, A
    bool has_direction_column = false;
    std::vector<curve_sweep> sweeps;  // approach/retract split (one entry when not split)
    // What the reader options decided against the file: a bias, temperature or unit given that
    // differs from the file's.
    std::vector<std::string> notes;
};

// Reads and parses a curve file. Throws tipgap::error (input) with file:line:column for: an empty
// file, a missing header, a missing z or current column (or one the options choose), a column
// without or with an unknown unit, a non-numeric, NaN or infinite cell, a row with the wrong
// number of cells, a bad direction value, a bad metadata value for a known key, fewer than 3
// data rows, or |I| that clearly rises with z (io/orientation.hpp); bad options throw as
// reader_options::validate(2).
measured_curve read_curve_csv(const std::string& path, const reader_options& options = {});

// Parses the text of a curve file; `file` names it in errors.
measured_curve parse_curve_csv(std::string_view text, const std::string& file, const reader_options& options = {});

// Splits rows into monotonic sweeps where z turns back. A turn is recognised once z has moved
// back from its running extreme by more than `turn_fraction` of the total z range (so that piezo
// jitter does not split a sweep); the cut is at the extreme.
// z_m: m, any order; current_A: same length; turn_fraction: (0, 1), default 0.05.
std::vector<curve_sweep> split_at_turns(const std::vector<double>& z_m, const std::vector<double>& current_A,
                                        double turn_fraction = 0.05);

}  // namespace tipgap
