#pragma once
// Operating warnings a user must see before using a setpoint at the instrument.
#include <string>
#include <vector>

#include "tipgap/model/current.hpp"

namespace tipgap {

// Thresholds (common practice, no source): below 0.35 nm or above 0.01 G0 the tip is close to
// point contact.
inline constexpr double near_contact_gap_m = 0.35e-9;
inline constexpr double near_contact_conductance_G0 = 0.01;

// Warnings for one operating point. gap_m: s (m); bias_V: sample bias (V); conductance_G0: I/V in
// units of G0 (negative = unknown); kind: regime from classify().
std::vector<std::string> operating_warnings(double gap_m, double bias_V, double conductance_G0, regime kind);

}  // namespace tipgap
