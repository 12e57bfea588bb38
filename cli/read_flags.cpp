#include "read_flags.hpp"

#include <cstdio>
#include <fmt/format.h>

#include "flags.hpp"
#include "ranges.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap::cli {

reader_options to_reader_options(const read_flags& f, const char* command, std::size_t roles) {
    reader_options o;
    if (!f.delimiter.empty() && !from_string(f.delimiter, o.delimiter))
        throw_usage("--delimiter", fmt::format("{} is not a delimiter; expected {}", quote_input(f.delimiter),
                                               accepted_names<delimiter_choice>()));
    if (!f.columns.empty()) o.columns = split_list(f.columns);
    o.z_unit = f.z_unit;
    o.current_unit = f.current_unit;
    o.xy_unit = f.xy_unit;
    o.flip_z = f.flip_z;
    if (!f.bias.empty()) o.bias_V = flag_quantity(f.bias, dimension::voltage, "--bias");
    if (!f.temperature.empty()) o.temperature_K = flag_quantity(f.temperature, dimension::temperature, "--temperature");
    naming_flags(command, flag_error::usage, [&] { o.validate(roles); });
    return o;
}

std::vector<flag> read_flag_list(read_flags& f, bool grid) {
    std::vector<flag> out = {
        {"--delimiter", "Cell separator: comma, tab, semicolon or space (runs of whitespace) (default: detected from the header row)",
         &f.delimiter, "comma|tab|semicolon|space"},
        {"--columns",
         grid ? "Columns of x, y, z and current: header names (any case, without unit) or 1-based indices, e.g. X,Y,Z,I "
                "or 1,2,3,4 (default: the columns named x, y, z and current or I)"
              : "Columns of z and current: header names (any case, without unit) or 1-based indices, e.g. Z,I or 2,3 "
                "(default: the columns named z and current or I); other columns are ignored",
         &f.columns, grid ? "X,Y,Z,I" : "Z,I"},
        {"--z-unit", "Unit of the z column when the header gives none or no header exists, e.g. nm (overrides the header's)",
         &f.z_unit, "UNIT"},
        {"--current-unit", "Unit of the current column when the header gives none, e.g. pA (overrides the header's)",
         &f.current_unit, "UNIT"},
    };
    if (grid) {
        out.push_back({"--xy-unit", "Unit of the x and y columns when the header gives none, e.g. nm (overrides the header's)",
                       &f.xy_unit, "UNIT"});
    }
    out.push_back({"--flip-z", "z in the file grows as the tip approaches: read it as -z (fits need z growing as the tip retracts)",
                   &f.flip_z});
    out.push_back({"--bias", "Bias for files without '# bias:', e.g. 100mV; a file stating another value is overridden, with a note",
                   &f.bias, "VOLTAGE"});
    out.push_back({"--temperature",
                   "Temperature for files without '# temperature:', e.g. 4.2K; a file stating another value is overridden, "
                   "with a note",
                   &f.temperature, "TEMPERATURE"});
    return out;
}

void print_notes(const std::vector<std::string>& notes, const std::string& file) {
    for (const std::string& n : notes) fmt::print(stderr, "tipgap: note: {}: {}\n", file, n);
}

}  // namespace tipgap::cli
