// _fit and _read_curve: fits of a curve held in arrays, each sweep a dict with the keys of one
// `tipgap fit` JSON curve (the same declared columns), and the project's curve reader.
#include <array>
#include <fmt/format.h>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include <pybind11/stl.h>

#include "bindings.hpp"
#include "convert.hpp"
#include "fit_keywords.hpp"
#include "keywords.hpp"
#include "tipgap/fit/fit_columns.hpp"
#include "tipgap/fit/fitted_sweep.hpp"
#include "tipgap/io/curve_arrays.hpp"
#include "tipgap/io/curve_io.hpp"

namespace tipgap::python {

namespace {

constexpr scaling to_nm = divided_by(1e-9);  // as the fit's JSON columns convert

py::list fit(const double_array& z_nm, const double_array& current_A, double bias_V, const py::dict& options,
             std::optional<config> model_config, const std::string& name) {
    const fit_options o = fit_options_from(options, "fit");
    // nm -> m as the curve reader converts a "z [nm]" column (value * 1e-9).
    std::vector<double> z = scaled_vector(z_nm, 1e-9), current = to_vector(current_A);
    // The profile (a list of rows in the JSON) is converted to columns straight from its
    // declaration below; the row's own "profile" cell only holds its place among the keys.
    static const auto declarations = [] {
        std::array<std::vector<column<fitted_sweep>>, 2> out{fitted_sweep_columns(false), fitted_sweep_columns(true)};
        for (auto& columns : out)
            for (auto& c : columns)
                if (c.key == "profile") c.get = [](const fitted_sweep&) { return cell(); };
        return out;
    }();
    std::optional<measured_curve> curve;
    std::vector<fitted_sweep> fits;
    std::vector<record> rows;
    {
        py::gil_scoped_release unlocked;
        naming_keywords("fit", [&] {
            curve.emplace(curve_from_arrays(name, std::move(z), std::move(current), bias_V));
            fits = fit_and_compare(*curve, o, model_config ? &*model_config : nullptr);
            for (const fitted_sweep& f : fits) rows.push_back(to_record(declarations[model_config ? 1 : 0], f));
        });
    }
    py::list out;
    for (std::size_t i = 0; i < rows.size(); ++i) {
        py::dict d = to_dict(rows[i], true);
        const std::vector<profile_point>& profile = fits[i].result.profile;
        d["profile"] = profile.empty() ? to_python(to_records(profile_columns(), profile), true)
                                       : py::object(declared_columns(profile_columns(), profile));
        out.append(d);
    }
    return out;
}

py::dict sweep_dict(const curve_sweep& s) {
    py::dict d;
    d["direction"] = to_string(s.direction);
    d["first_row"] = s.first_row;
    d["z_nm"] = to_array(s.z_m, to_nm);
    d["current_A"] = to_array(s.current_A, {});
    return d;
}

py::dict read_curve(const std::string& path, double turn_fraction) {
    if (!(turn_fraction > 0.0 && turn_fraction < 1.0))
        throw_input(location{"", 0, 0, "turn_fraction"}, fmt::format("{:g} is out of range; expected a fraction in (0, 1)", turn_fraction));
    measured_curve c;
    {
        py::gil_scoped_release unlocked;
        c = read_curve_csv(path);
        if (!c.has_direction_column) c.sweeps = split_at_turns(c.z_m, c.current_A, turn_fraction);
    }
    py::dict d;
    d["file"] = c.file;
    py::dict meta;
    for (const auto& [k, v] : c.metadata.entries) meta[py::str(k)] = v;
    d["metadata"] = meta;
    d["bias_V"] = c.metadata.bias_V ? py::object(py::float_(*c.metadata.bias_V)) : py::none();
    d["z_nm"] = to_array(c.z_m, to_nm);
    d["current_A"] = to_array(c.current_A, {});
    py::list sweeps;
    for (const curve_sweep& s : c.sweeps) sweeps.append(sweep_dict(s));
    d["sweeps"] = sweeps;
    return d;
}

}  // namespace

void bind_fit(py::module_& m) {
    m.def("_fit", &fit, py::arg("z_nm"), py::arg("current_A"), py::arg("bias_V"), py::arg("options"), py::arg("config"),
          py::arg("name"));
    m.def("_read_curve", &read_curve, py::arg("path"), py::arg("turn_fraction"));
}

}  // namespace tipgap::python
