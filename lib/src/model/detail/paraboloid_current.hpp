#pragma once
// The paraboloid current from an apex sample: shared by total_current and the point-wise paths.
#include "tipgap/model/geometry.hpp"

namespace tipgap::detail {

// 2 pi R ∫_0^inf j(s + u) du where j is the current density at bias V (zero_bias false) or the
// zero-bias conductance density (zero_bias true, V ignored); apex: j and dj/ds at s. d_dV, when
// given and zero_bias is false: dI/dV (A/V) from the same Gauss-Laguerre nodes, or NaN where the
// adaptive rule had to be used.
double paraboloid_density_integral(const model_options& model, double R, double s, double V, bool zero_bias,
                                   const gap_sample& apex, double* d_dV = nullptr);

}  // namespace tipgap::detail
