#pragma once
// The quality code of one map pixel; internal to the library (map_build.cpp, and tests).
#include "tipgap/fit/fit.hpp"
#include "tipgap/grid/map.hpp"

namespace tipgap {

// The quality code of one pixel from its fit (see pixel_quality for the rules and their
// precedence). fitted: false when the pixel's fit found too few points (r is then not used).
pixel_quality classify_pixel(const fit_result& r, bool fitted, const map_options& options);

}  // namespace tipgap
