#pragma once
// The figures of `tipgap map`: the apparent-barrier map, its standard-error map, the quality-code
// map and the histogram of its pixels.
#include <optional>

#include "tipgap/grid/map.hpp"
#include "tipgap/plot/plot.hpp"

namespace tipgap {

struct map_figure_options {
    // Colour range of the apparent-barrier map (J); both or neither, barrier_min_J < barrier_max_J.
    // Default: the 1st to 99th percentile of the pixels.
    std::optional<double> barrier_min_J;
    std::optional<double> barrier_max_J;
    // Throws tipgap::error (input) with key "range" when only one end is set or min >= max.
    void validate() const;
};

// Colour map of phi_ap (eV) over x and y (nm), equal aspect; colours span options' range, else the
// 1st to 99th percentile so that a few wild pixels do not wash out the map.
plot::figure barrier_map_figure(const barrier_map& m, const map_figure_options& options = {});

// Colour map of the standard error of phi_ap (eV), colours over the 1st to 99th percentile.
plot::figure stderr_map_figure(const barrier_map& m);

// Map of the quality codes (0 ok .. 4 poor_fit, legend in the title), one colour band per code.
plot::figure quality_map_figure(const barrier_map& m);

// Histogram of the pixels' phi_ap (eV) with the mean and the median marked.
plot::figure barrier_histogram_figure(const barrier_map& m);

}  // namespace tipgap
