// _synth_curve: a synthetic I(z) curve from the library's synthesiser, as arrays, with its ground
// truth from the declared columns `tipgap synth` reports.
#include <fmt/format.h>
#include <string>
#include <vector>

#include <pybind11/stl.h>

#include "bindings.hpp"
#include "convert.hpp"
#include "keywords.hpp"
#include "tipgap/synth/synth.hpp"
#include "tipgap/synth/synth_columns.hpp"

namespace tipgap::python {

namespace {

synth_options synth_options_from(const py::dict& k, const model_options& model) {
    synth_options o;
    auto number = [&](const char* key) { return py::cast<double>(k[key]); };
    o.bias_V = number("bias_V");
    const auto gap = py::cast<std::vector<double>>(k["gap_nm"]);
    if (gap.size() != 2)
        throw_input(location{"", 0, 0, "gap_nm"}, fmt::format("{} values; expected a range (closest, farthest) in nm", gap.size()));
    o.gap_min_m = gap[0] * 1e-9;
    o.gap_max_m = gap[1] * 1e-9;
    const long points = py::cast<long>(k["points"]);
    if (points < 0) throw_input(location{"", 0, 0, "points"}, "must be in [8, 1000000]");
    o.points = static_cast<std::size_t>(points);
    if (!k["gap_at_z0_nm"].is_none()) o.gap_at_z0_m = number("gap_at_z0_nm") * 1e-9;
    const std::string sweeps = py::cast<std::string>(k["sweeps"]);
    if (!from_string(sweeps, o.sweeps))
        throw_input(location{"", 0, 0, "sweeps"}, fmt::format("expected retract, approach or approach_retract, got {}", quote_input(sweeps)));
    o.current_noise_A = number("noise_A");
    o.baseline_A = number("baseline_A");
    o.saturation_A = number("saturation_A");
    o.drift_m = number("drift_nm") * 1e-9;
    o.jump_gap_m = number("jump_gap_nm") * 1e-9;
    o.contact_conductance_G0 = number("contact_conductance_G0");
    o.seed = py::cast<std::uint64_t>(k["seed"]);
    naming_keywords("synth_curve", [&] { o.validate(model); });
    return o;
}

py::dict truth_dict(const synth_truth& t) {
    py::dict d = to_dict(to_record(synth_truth_columns(), t));
    std::vector<record> sweeps;
    for (const synth_sweep_truth& s : t.sweeps) sweeps.push_back(to_record(synth_sweep_columns(), s));
    py::list l;
    for (const record& r : sweeps) l.append(to_dict(r));
    d["sweeps"] = l;
    return d;
}

py::dict synth(const config& c, const py::dict& options) {
    const synth_options o = synth_options_from(options, c.model);
    synth_curve curve;
    {
        py::gil_scoped_release unlocked;
        curve = synthesise_curve(c, o);
    }
    const std::size_t n = curve.samples.size();
    std::vector<double> z(n), current(n), gap(n), model(n);
    py::array_t<bool> contact(static_cast<py::ssize_t>(n));
    py::list direction;
    for (std::size_t i = 0; i < n; ++i) {
        const synth_sample& s = curve.samples[i];
        z[i] = s.z_m;
        current[i] = s.current_A;
        gap[i] = s.true_gap_m;
        model[i] = s.model_current_A;
        contact.mutable_data()[i] = s.in_contact;
        direction.append(to_string(s.direction));
    }
    constexpr scaling to_nm = times(1e9);  // as the synth truth columns convert
    py::dict d;
    d["z_nm"] = to_array(z, to_nm);
    d["current_A"] = to_array(current);
    d["true_gap_nm"] = to_array(gap, to_nm);
    d["model_current_A"] = to_array(model);
    d["direction"] = direction;
    d["in_contact"] = contact;
    d["bias_V"] = o.bias_V;
    d["truth"] = truth_dict(curve.truth);
    return d;
}

}  // namespace

void bind_synth(py::module_& m) { m.def("_synth_curve", &synth, py::arg("config"), py::arg("options")); }

}  // namespace tipgap::python
