#pragma once
// The reader options of `tipgap fit` and `tipgap map` (and their help texts): delimiter, columns,
// units, z orientation, and the bias and temperature of files that do not state them.
#include <cstddef>
#include <string>
#include <vector>

#include "command.hpp"
#include "tipgap/io/reader_options.hpp"

namespace tipgap::cli {

struct read_flags {
    std::string delimiter, columns, z_unit, current_unit, xy_unit, bias, temperature;
    bool flip_z = false;
};

// --delimiter, --columns, --z-unit, --current-unit, (grid) --xy-unit, --flip-z, --bias and
// --temperature.
std::vector<flag> read_flag_list(read_flags& f, bool grid);

// The options the flags ask for, validated by the library for `roles` columns (2: z, current; 4:
// x, y, z, current); a bad value is a usage error naming its flag. command: "fit" or "map".
reader_options to_reader_options(const read_flags& f, const char* command, std::size_t roles);

// Prints each note of `file` to stderr as "tipgap: note: FILE: ...".
void print_notes(const std::vector<std::string>& notes, const std::string& file);

}  // namespace tipgap::cli
