#pragma once
// Tunnelling current density through the planar gap (Tsu-Esaki form) and the quantities derived
// from it at one (gap, bias) point.
#include <string>

#include "tipgap/model/model.hpp"

namespace tipgap {

// Supply function N(E) = kT ln[(1 + e^(-E/kT)) / (1 + e^(-(E+eV)/kT))] (J), its exact T = 0 limit
// when kT_J == 0. E_J: normal energy from the tip Fermi level (J); eV_J: e times the sample bias (J);
// kT_J: thermal energy (J), >= 0.
double supply_function(double E_J, double eV_J, double kT_J);

// Current density J (A/m^2) through a planar gap, with the sign of the bias.
// gap_m: s (m), > 0; bias_V: sample bias (V), |V| <= options.bias_limit_V.
// Method and tolerance from options (wkb: relative accuracy options.rel_tol).
double current_density(const model_options& options, double gap_m, double bias_V);

enum class regime {
    direct_tunnelling,  // eV below the barrier: trapezoidal tunnelling
    field_emission,     // |eV| exceeds the barrier on the collector side: triangular barrier
    barrier_collapsed,  // the image-lowered top is below the emitting Fermi level: model invalid
};
template <>
struct enum_names<regime> {
    static constexpr enum_name<regime> table[] = {{regime::direct_tunnelling, "direct_tunnelling"},
                                                  {regime::field_emission, "field_emission"},
                                                  {regime::barrier_collapsed, "barrier_collapsed"}};
};

// Everything `predict` reports at one point.
struct point_quantities {
    double gap_m = 0, bias_V = 0, temperature_K = 0;
    double current_density_A_per_m2 = 0;
    double conductance_density_S_per_m2 = 0;  // J / V (zero-bias limit dJ/dV when V = 0)
    double differential_conductance_density_S_per_m2 = 0;  // dJ/dV
    double decay_constant_per_m = 0;          // kappa = -1/2 d ln|J| / ds
    double apparent_barrier_J = 0;            // (hbar^2 / 8m) (d ln|J| / ds)^2
    double barrier_top_J = 0;                 // maximum of U above the emitting Fermi level
    double barrier_width_m = 0;               // forbidden width at the emitting Fermi level
    regime kind = regime::direct_tunnelling;
};

// Evaluates J and its derivatives (central differences, steps chosen for the tolerance).
point_quantities evaluate_point(const model_options& options, double gap_m, double bias_V);

// Regime label and barrier top/width at the emitting Fermi level, without computing J.
regime classify(const model_options& options, double gap_m, double bias_V, double* top_J = nullptr,
                double* width_m = nullptr);

}  // namespace tipgap
