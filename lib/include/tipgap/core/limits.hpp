#pragma once
// Inclusive limits compared with a relative tolerance: "100nm" parses to 1.0000000000000001e-07 m,
// which a plain `gap <= 100e-9` refuses against a documented range (0, 100] nm. A value within
// limit_rel_tol of an inclusive limit counts as on it (common practice, no source).
#include <cmath>

namespace tipgap {

constexpr double limit_rel_tol = 1e-12;

// v <= hi, with v finite and up to limit_rel_tol * |hi| beyond hi allowed.
inline bool at_most(double v, double hi) { return std::isfinite(v) && v <= hi + limit_rel_tol * std::abs(hi); }
// v >= lo, with v finite and up to limit_rel_tol * |lo| below lo allowed.
inline bool at_least(double v, double lo) { return std::isfinite(v) && v >= lo - limit_rel_tol * std::abs(lo); }

}  // namespace tipgap
