#include "tipgap/synth/synth_columns.hpp"

#include <fmt/format.h>

#include "tipgap/core/constants.hpp"

namespace tipgap {

namespace {
constexpr scaling to_eV = divided_by(si::electron_volt), to_per_nm = times(1e-9), to_nm = times(1e9);
constexpr table_number d3 = fixed(3), d4 = fixed(4);
}  // namespace

const std::vector<column<synth_truth>>& synth_truth_columns() {
    using t = synth_truth;
    static const std::vector<column<t>> columns = {
        {"decay_constant_range_per_nm", "kappa [1/nm]", [](const t& x) { return x.decay_constant_range_per_m; }, to_per_nm, d4},
        {"apparent_barrier_range_eV", "phi_ap [eV]", [](const t& x) { return x.apparent_barrier_range_J; }, to_eV, d4},
        {"mean_work_function_eV", "W [eV]", [](const t& x) { return x.mean_work_function_J; }, to_eV, d4},
        {"tip_work_function_eV", "tip [eV]", [](const t& x) { return x.tip_work_function_J; }, to_eV, d4},
        {"sample_work_function_eV", "sample [eV]", [](const t& x) { return x.sample_work_function_J; }, to_eV, d4},
        {"gap_at_z0_nm", "gap at z0 [nm]", [](const t& x) { return x.gap_at_z0_m; }, to_nm, d4},
        {"noise_floor_A", "floor [A]", [](const t& x) { return x.noise_floor_A; }},
    };
    return columns;
}

const std::vector<column<synth_sweep_truth>>& synth_sweep_columns() {
    using s = synth_sweep_truth;
    static const std::vector<column<s>> columns = {
        {"direction", "sweep", [](const s& x) { return to_string(x.direction); }},
        {"usable_points", "usable", [](const s& x) { return x.usable_points; }},
        {"decay_constant_expected_per_nm", "kappa [1/nm]", [](const s& x) { return x.decay_constant_expected_per_m; }, to_per_nm, d4},
        {"apparent_barrier_expected_eV", "phi_ap [eV]", [](const s& x) { return x.apparent_barrier_expected_J; }, to_eV, d4},
        {"decay_constant_model_per_nm", "model kappa", [](const s& x) { return x.decay_constant_model_per_m; }, to_per_nm, d4},
        {"apparent_barrier_model_eV", "model phi_ap", [](const s& x) { return x.apparent_barrier_model_J; }, to_eV, d4},
        {"first_row", "first row", [](const s& x) { return x.first_row; }},
        {"rows", "rows", [](const s& x) { return x.rows; }},
    };
    return columns;
}

const std::vector<column<grid_region_truth>>& grid_region_columns() {
    using g = grid_region_truth;
    static const std::vector<column<g>> columns = {
        {"name", "region", [](const g& x) { return x.name; }},
        {"pixels", "pixels", [](const g& x) { return x.pixels; }},
        {"sample_work_function_eV", "sample [eV]", [](const g& x) { return x.sample_work_function_J; }, to_eV, d3},
        {"apparent_barrier_expected_eV", "phi_ap [eV]", [](const g& x) { return x.apparent_barrier_expected_J; }, to_eV, d4},
        {"decay_constant_expected_per_nm", "kappa [1/nm]", [](const g& x) { return x.decay_constant_expected_per_m; }, to_per_nm, d4},
        {"mean_work_function_eV", "W [eV]", [](const g& x) { return x.mean_work_function_J; }, to_eV, d4},
        {"apparent_barrier_range_eV", "range phi_ap", [](const g& x) { return x.apparent_barrier_range_J; }, to_eV, d4},
        {"decay_constant_range_per_nm", "range kappa", [](const g& x) { return x.decay_constant_range_per_m; }, to_per_nm, d4},
    };
    return columns;
}

std::string synth_curve_summary(const synth_curve& curve, const synth_options& o) {
    std::string s = fmt::format("model over {:.3g}..{:.3g} nm: {}", o.gap_min_m / 1e-9, o.gap_max_m / 1e-9,
                                format_line(synth_truth_columns(), curve.truth,
                                            "kappa {decay_constant_range_per_nm} 1/nm, phi_ap {apparent_barrier_range_eV} eV "
                                            "(mean work function {mean_work_function_eV} eV)\n"));
    for (const synth_sweep_truth& w : curve.truth.sweeps)
        s += format_line(synth_sweep_columns(), w,
                         "  {direction}: {usable_points} usable points, expected fit kappa "
                         "{decay_constant_expected_per_nm} 1/nm, phi_ap {apparent_barrier_expected_eV} eV\n");
    return s;
}

std::string synth_grid_summary(const synth_grid_truth& t) {
    std::string s;
    for (const grid_region_truth& r : t.regions)
        s += format_line(grid_region_columns(), r,
                         "  {name}: {pixels} pixels, sample work function {sample_work_function_eV} eV, phi_ap "
                         "{apparent_barrier_expected_eV} eV (kappa {decay_constant_expected_per_nm} 1/nm)\n");
    return s;
}

std::string zv_trace_summary(const zv_synth_trace& t) {
    std::string s = fmt::format("sample work function {:.4f} eV; resonances of the noise-free dz/dV at",
                                t.sample_work_function_J / si::electron_volt);
    for (double v : t.peaks_V) s += fmt::format(" {:.3f}", v);
    return s + " V\n";
}

}  // namespace tipgap
