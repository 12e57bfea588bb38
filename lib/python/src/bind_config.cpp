// tipgap.Config: a junction configuration (the library's config), immutable from Python;
// replace() returns a modified, validated copy.
#include <fmt/format.h>
#include <functional>
#include <pybind11/stl.h>
#include <string>
#include <utility>
#include <vector>

#include "bindings.hpp"
#include "convert.hpp"
#include "keywords.hpp"
#include "tipgap/config/config.hpp"
#include "tipgap/config/config_summary.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap::python {

namespace {

double number(const py::handle& v) { return py::cast<double>(v); }

// A standard uncertainty (config.sigma) in SI: finite and >= 0, like "± u" in a config file.
double sigma(const py::handle& v, double factor, const char* keyword) {
    const double u = number(v);
    if (!(std::isfinite(u) && u >= 0.0))
        throw_input(location{"", 0, 0, keyword}, fmt::format("{:g} is not a standard uncertainty; expected a value >= 0", u));
    return u * factor;
}

electrode from_material(const py::handle& v, const char* keyword) {
    const material_entry m = find_material(py::cast<std::string>(v), location{"", 0, 0, keyword});
    return electrode{m.name, m.work_function_J, m.fermi_energy_J};
}

template <class E>
E named(const py::handle& v, const char* keyword, const char* expected) {
    const std::string s = py::cast<std::string>(v);
    E out{};
    if (!from_string(s, out)) throw_input(location{"", 0, 0, keyword}, fmt::format("{} is not {}", quote_input(s), expected));
    return out;
}

using setter = std::function<void(config&, const py::handle&)>;

// Config.replace's keywords, in the order they are applied (materials first, so that a work
// function given with them overrides the material's, as in a config file).
const std::vector<std::pair<std::string, setter>>& setters() {
    static const std::vector<std::pair<std::string, setter>> s = {
        {"tip_material", [](config& c, const py::handle& v) { c.model.tip = from_material(v, "tip_material"); }},
        {"sample_material", [](config& c, const py::handle& v) { c.model.sample = from_material(v, "sample_material"); }},
        {"tip_work_function_eV", [](config& c, const py::handle& v) { c.model.tip.work_function_J = number(v) * eV; }},
        {"sample_work_function_eV", [](config& c, const py::handle& v) { c.model.sample.work_function_J = number(v) * eV; }},
        {"tip_fermi_energy_eV", [](config& c, const py::handle& v) { c.model.tip.fermi_energy_J = number(v) * eV; }},
        {"sample_fermi_energy_eV", [](config& c, const py::handle& v) { c.model.sample.fermi_energy_J = number(v) * eV; }},
        {"tip_work_function_stddev_eV",
         [](config& c, const py::handle& v) { c.sigma.tip_work_function_J = sigma(v, eV, "tip_work_function_stddev_eV"); }},
        {"sample_work_function_stddev_eV",
         [](config& c, const py::handle& v) { c.sigma.sample_work_function_J = sigma(v, eV, "sample_work_function_stddev_eV"); }},
        {"image_potential",
         [](config& c, const py::handle& v) {
             c.model.image = named<image_kind>(v, "image_potential", "an image potential; expected exact, approximate or none");
         }},
        {"relative_permittivity", [](config& c, const py::handle& v) { c.model.relative_permittivity = number(v); }},
        {"temperature_K", [](config& c, const py::handle& v) { c.model.temperature_K = number(v); }},
        {"method",
         [](config& c, const py::handle& v) { c.model.method = named<method_kind>(v, "method", "a method; expected wkb, simmons or exact"); }},
        {"tolerance", [](config& c, const py::handle& v) { c.model.rel_tol = number(v); }},
        {"bias_limit_V", [](config& c, const py::handle& v) { c.model.bias_limit_V = number(v); }},
        {"geometry",
         [](config& c, const py::handle& v) {
             c.geometry.kind = named<geometry_kind>(v, "geometry", "a geometry; expected planar, paraboloid or contact_anchored");
         }},
        {"area_nm2", [](config& c, const py::handle& v) { c.geometry.area_m2 = number(v) * 1e-18; }},
        {"apex_radius_nm", [](config& c, const py::handle& v) { c.geometry.apex_radius_m = number(v) * 1e-9; }},
        {"apex_radius_stddev_nm",
         [](config& c, const py::handle& v) { c.sigma.apex_radius_m = sigma(v, 1e-9, "apex_radius_stddev_nm"); }},
        {"contact_distance_nm", [](config& c, const py::handle& v) { c.geometry.contact_distance_m = number(v) * 1e-9; }},
    };
    return s;
}

std::string keyword_list() {
    std::string out;
    for (const auto& [k, f] : setters()) out += (out.empty() ? "" : ", ") + k;
    return out;
}

config replaced(const config& c, const py::kwargs& kwargs) {
    for (const auto& [k, v] : kwargs) {
        const std::string key = py::cast<std::string>(k);
        bool known = false;
        for (const auto& [name, f] : setters()) known = known || name == key;
        if (!known)
            throw py::type_error(fmt::format("Config.replace() got an unexpected keyword argument '{}'; expected one of: {}",
                                             key, keyword_list()));
    }
    config out = c;
    for (const auto& [name, f] : setters())
        if (kwargs.contains(name)) f(out, kwargs[py::str(name)]);
    naming_keywords("replace", [&] {
        out.model.validate();
        out.geometry.validate();
    });
    return out;
}

std::string repr(const config& c) {
    auto e = [](const electrode& x) { return fmt::format("{} {:g} eV", x.material.empty() ? "?" : x.material, x.work_function_J / eV); };
    return fmt::format("tipgap.Config({}: tip {}, sample {}, T = {:g} K, image {}, method {}, geometry {})", c.source,
                       e(c.model.tip), e(c.model.sample), c.model.temperature_K, to_string(c.model.image),
                       to_string(c.model.method), to_string(c.geometry.kind));
}

}  // namespace

void bind_config(py::module_& m) {
    py::class_<config>(m, "Config",
                       "A junction configuration: tip and sample electrodes, barrier, temperature, method, tip geometry\n"
                       "and input uncertainties. Immutable: replace() returns a modified copy.")
        .def_static("default", &default_config, "The built-in configuration (tungsten tip over gold at 4.2 K).")
        .def_static("from_yaml", &load_config, py::arg("path"),
                    "Loads a YAML configuration file; errors raise tipgap.Error with the CLI's message.")
        .def_static(
            "from_text", [](const std::string& text, const std::string& name) { return parse_config(text, name); },
            py::arg("yaml"), py::arg("name") = "<text>",
            "Parses YAML text; `name` stands for the file in error messages.")
        .def("replace", &replaced,
             "replace(**changes) -> Config: a validated copy with these keywords changed.\n\n"
             "tip_material, sample_material    a name from the materials library (sets the work function\n"
             "                                 and Fermi energy; keywords below override them)\n"
             "tip_work_function_eV, sample_work_function_eV    (0, 20] eV\n"
             "tip_fermi_energy_eV, sample_fermi_energy_eV      (0, 50] eV\n"
             "tip_work_function_stddev_eV, sample_work_function_stddev_eV   standard uncertainty, >= 0 eV\n"
             "image_potential                  'exact', 'approximate' or 'none'\n"
             "relative_permittivity            [1, 1000] (1: vacuum)\n"
             "temperature_K                    [0, 2000] K\n"
             "method                           'wkb', 'simmons' or 'exact'\n"
             "tolerance                        relative accuracy of J, [1e-12, 1e-2]\n"
             "bias_limit_V                     (0, 100] V\n"
             "geometry                         'planar', 'paraboloid' or 'contact_anchored'\n"
             "area_nm2                         planar area, (0, 1e12] nm^2\n"
             "apex_radius_nm                   paraboloid apex radius, (0, 10000] nm\n"
             "apex_radius_stddev_nm            standard uncertainty, >= 0 nm\n"
             "contact_distance_nm              gap where G = G0 (contact_anchored), (0, 1) nm\n\n"
             "Raises tipgap.Error naming the keyword for a value out of range, TypeError for an unknown keyword.")
        .def("to_dict", [](const config& c) { return to_dict(config_record(c)); },
             "The configuration as the `config` block of the CLI's JSON output.")
        .def_property_readonly("source", [](const config& c) { return c.source; },
                               "The file it was read from, '<default>' or the name given to from_text.")
        .def("__repr__", &repr)
        .def("__copy__", [](const config& c) { return c; })
        .def("__deepcopy__", [](const config& c, const py::dict&) { return c; });
    m.def("_config_keywords", [] {
        std::vector<std::string> out;
        for (const auto& [k, f] : setters()) out.push_back(k);
        return out;
    });
}

}  // namespace tipgap::python
