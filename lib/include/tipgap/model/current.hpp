#pragma once
// Tunnelling current density through the planar gap (Tsu-Esaki form) and the quantities derived
// from it at one (gap, bias) point.
#include <limits>
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
    // d ln|J|/dV (1/V): (dJ/dV)/J, NaN at V = 0 (where J = 0). Equal to d ln|I|/dV whenever the tip
    // area is fixed (planar, contact-anchored); predict_points replaces it by the total current's for
    // a paraboloid tip. With `method: exact` its peaks are the field-emission resonances.
    double dlnI_dV_per_V = std::numeric_limits<double>::quiet_NaN();
    double decay_constant_per_m = 0;          // kappa = -1/2 d ln|J| / ds
    double apparent_barrier_J = 0;            // (hbar^2 / 8m) (d ln|J| / ds)^2
    double barrier_top_J = 0;                 // maximum of U above the emitting Fermi level
    double barrier_width_m = 0;               // forbidden width at the emitting Fermi level
    regime kind = regime::direct_tunnelling;
};

// Central-difference step (V) of the bias derivatives at bias_V (V): max(1 mV, 1 % of |V|), and
// 0.2 % for `method: exact`, whose resonances are narrower than 1 % of the bias.
double bias_step(const model_options& options, double bias_V);

// J and its first derivatives at one (gap, bias) point.
struct current_density_slopes {
    double current_density_A_per_m2 = 0;  // J, equal to current_density() bit for bit
    double d_ds_A_per_m3 = 0;             // dJ/ds at fixed bias
    double d_dV_S_per_m2 = 0;             // dJ/dV at fixed gap (NaN when not asked for)
};

// method wkb: one pass of the energy integral; the derivatives are integrated on the same nodes as
// J (the s- and V-derivatives of the WKB exponent, differentiated under its integral, and of the
// supply function), at the cost of about 1.2-1.5 J. Other methods: central differences of ln|J| in
// s (step min(0.01 nm, s/4)) and of J in V (step bias_step: max(1 mV, 1 % of |V|), 0.2 % for exact).
// gap_m: s (m), > 0; bias_V: sample bias (V); bias_derivative: also compute dJ/dV.
current_density_slopes current_density_derivatives(const model_options& options, double gap_m, double bias_V,
                                                   bool bias_derivative = true);

// Zero-bias conductance density G = dJ/dV at V = 0 and its gap derivative, the linear-response
// limit in which J = G V. method wkb: one pass with the supply's bias derivative e f(E) as weight;
// other methods: J at +-1 mV and ln|J(s +- h, 1 mV)| differences. gap_m: s (m), > 0.
struct zero_bias_conductance {
    double conductance_density_S_per_m2 = 0;  // G (S/m^2)
    double d_ds_S_per_m3 = 0;                 // dG/ds (S/m^3)
};
zero_bias_conductance zero_bias_conductance_density(const model_options& options, double gap_m);

// Evaluates J and its derivatives at one point (current_density_derivatives; at V = 0 the decay
// constant comes from the zero-bias conductance, whose gap dependence J/V shares in the
// linear-response limit).
point_quantities evaluate_point(const model_options& options, double gap_m, double bias_V);

// Regime label and barrier top/width at the emitting Fermi level, without computing J.
regime classify(const model_options& options, double gap_m, double bias_V, double* top_J = nullptr,
                double* width_m = nullptr);

}  // namespace tipgap
