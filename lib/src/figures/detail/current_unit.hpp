#pragma once
// The current unit a figure shows, chosen from the data so that its numbers stay readable.
#include <string>

namespace tipgap::figures_detail {

struct current_unit_choice {
    double per_A = 1e12;        // numbers in the unit per ampere
    const char* name = "pA";
};

// pA below 1 nA, nA below 1 µA, µA below 1 mA, else mA: numbers between 0.1 and 1000 on a linear
// axis and a log10 axis that starts near 0. max_abs_A: largest |I| shown (A), ≥ 0.
current_unit_choice current_unit(double max_abs_A);

}  // namespace tipgap::figures_detail
