#pragma once
// Which way z runs in a measured curve. Every fit assumes that z grows as the tip retracts, so
// that |I| falls with z; a file whose z grows as the tip approaches must be read with
// reader_options::flip_z. The readers refuse a curve (or a grid whose pixels mostly) rise clearly,
// before any fit could turn it into a negative decay constant.
#include <cstddef>
#include <span>

namespace tipgap {

enum class z_orientation {
    current_falls,  // |I| clearly falls as z grows: z grows as the tip retracts
    current_rises,  // |I| clearly rises as z grows: z grows as the tip approaches
    unclear,        // too few points, no spread in z, or less than the factor between the ends
};

struct orientation_check {
    z_orientation orientation = z_orientation::unclear;
    double near_median_A = 0.0;    // median |I| of the quarter of the points with the smallest z, A
    double far_median_A = 0.0;     // median |I| of the quarter with the largest z, A
    std::size_t quarter_points = 0;
};

// Compares the median |I| of the quarter of the points with the largest z with that of the
// quarter with the smallest z. "Clearly" means a ratio beyond √10 (half a decade) either way, with
// at least 3 points per quarter and the two quarters' z ranges apart: a tunnelling curve over
// 0.1 nm at κ = 10 /nm already differs by e^1.5 ≈ 4.5 between its quarters, while noise about a
// constant current stays near a ratio of 1 (thresholds: common practice, no source). Medians
// ignore a contact jump or a saturated top. z_m: m, any order; current_A: same length.
orientation_check check_orientation(std::span<const double> z_m, std::span<const double> current_A);

}  // namespace tipgap
