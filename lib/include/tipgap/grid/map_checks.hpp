#pragma once
// Checks of a finished barrier map before a command reports it.
#include "tipgap/grid/map.hpp"

namespace tipgap {

// Throws tipgap::error (no_answer, naming the grid's path) when no pixel has a value: a map of
// blanks would look like an answer. The message counts the pixels of each quality.
void require_fitted_pixel(const barrier_map& m);

}  // namespace tipgap
