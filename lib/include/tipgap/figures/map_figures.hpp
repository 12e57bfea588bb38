#pragma once
// The figures of `tipgap map`: the apparent-barrier map and the histogram of its pixels.
#include "tipgap/grid/map.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap {

// Colour map of phi_ap (eV) over x and y (nm), equal aspect; colours span the 1st to 99th
// percentile so that a few wild pixels do not wash out the map.
plot::figure barrier_map_figure(const barrier_map& m);

// Histogram of the pixels' phi_ap (eV) with the mean and the median marked.
plot::figure barrier_histogram_figure(const barrier_map& m);

}  // namespace tipgap
