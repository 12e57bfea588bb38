// The command line over a config (apply_overlay) and the merged config as YAML with each value's
// origin (config_yaml, for --show-config).
#include <fmt/format.h>
#include <functional>

#include "tipgap/config/config.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap {

namespace {

// The origin of a value the overlay field `field` set: "command line", or "command line (--tip)"
// when the caller names the field's flag.
using origin_namer = std::function<std::string(std::string_view)>;

void overlay_electrode(config& c, const std::string& key, electrode& e, double& sigma, const std::string& material,
                       const std::optional<double>& work_function_J, const origin_namer& origin) {
    if (!material.empty()) {
        location w;
        w.key = key + ".material";
        const material_entry m = find_material(material, w);
        e = electrode{m.name, m.work_function_J, m.fermi_energy_J};
        sigma = 0;
        for (const char* k : {".material", ".work_function", ".fermi_energy"}) c.origin[key + k] = origin(key + ".material");
    }
    if (work_function_J) {
        e.work_function_J = *work_function_J;
        sigma = 0;
        c.origin[key + ".work_function"] = origin(key + ".work_function");
        if (material.empty()) {
            e.material.clear();
            c.origin[key + ".material"] = origin(key + ".work_function");
        }
    }
}

// 15 significant digits: a value read from text ("5.53 eV") reads back as the same double.
std::string number(double v) { return fmt::format("{:.15g}", v); }

template <class E>
std::optional<E> enum_value(const std::string& text, const char* key, const char* what) {
    E e{};
    if (text.empty()) return std::nullopt;
    if (!from_string(text, e))
        throw_input(location{"", 0, 0, key}, fmt::format("{} is not {}; expected {}", quote_input(text), what, accepted_names<E>()));
    return e;
}

std::optional<double> quantity(const std::string& text, dimension d, const char* key) {
    if (text.empty()) return std::nullopt;
    return parse_quantity(text, d, location{"", 0, 0, key});
}

}  // namespace

junction_overlay parse_overlay(const junction_text& t) {
    junction_overlay o;
    o.tip_material = t.tip;
    o.sample_material = t.sample;
    o.tip_work_function_J = quantity(t.tip_work_function, dimension::energy, "tip.work_function");
    o.sample_work_function_J = quantity(t.sample_work_function, dimension::energy, "sample.work_function");
    o.temperature_K = quantity(t.temperature, dimension::temperature, "temperature");
    o.image = enum_value<image_kind>(t.image, "barrier.image_potential", "an image potential");
    o.method = enum_value<method_kind>(t.method, "method", "a method");
    return o;
}

void apply_overlay(config& c, const junction_overlay& o, const std::string& origin,
                   const std::function<std::string(std::string_view)>& flag_of) {
    const origin_namer named = [&](std::string_view field) {
        return flag_of ? fmt::format("{} ({})", origin, flag_of(field)) : origin;
    };
    overlay_electrode(c, "tip", c.model.tip, c.sigma.tip_work_function_J, o.tip_material, o.tip_work_function_J, named);
    overlay_electrode(c, "sample", c.model.sample, c.sigma.sample_work_function_J, o.sample_material,
                      o.sample_work_function_J, named);
    if (o.temperature_K) {
        c.model.temperature_K = *o.temperature_K;
        c.origin["temperature"] = named("temperature");
    }
    if (o.image) {
        c.model.image = *o.image;
        c.origin["barrier.image_potential"] = named("barrier.image_potential");
    }
    if (o.method) {
        c.model.method = *o.method;
        c.origin["method"] = named("method");
    }
    c.model.validate();
    const bool any = !o.tip_material.empty() || !o.sample_material.empty() || o.tip_work_function_J ||
                     o.sample_work_function_J || o.temperature_K || o.image || o.method;
    if (any) c.source += " + " + origin;
}

std::string config_yaml(const config& c) {
    const double eV = si::electron_volt;
    auto line = [&](const std::string& indent, const std::string& name, const std::string& key, const std::string& value) {
        const auto o = c.origin.find(key);
        return fmt::format("{}{}: {}  # {}\n", indent, name, value, o == c.origin.end() ? "built-in default" : o->second);
    };
    auto energy = [&](double v, double sigma) {
        return sigma > 0 ? fmt::format("{} eV ± {} eV", number(v / eV), number(sigma / eV)) : number(v / eV) + " eV";
    };
    std::string out = "# merged configuration (precedence: built-in default < config file < command line);\n"
                      "# each value's origin follows it\n";
    auto block = [&](const char* key, const electrode& e, double sigma) {
        out += fmt::format("{}:\n", key);
        const std::string k = key;
        if (!e.material.empty()) out += line("  ", "material", k + ".material", e.material);
        out += line("  ", "work_function", k + ".work_function", energy(e.work_function_J, sigma));
        out += line("  ", "fermi_energy", k + ".fermi_energy", energy(e.fermi_energy_J, 0));
    };
    block("tip", c.model.tip, c.sigma.tip_work_function_J);
    block("sample", c.model.sample, c.sigma.sample_work_function_J);
    out += "barrier:\n";
    out += line("  ", "image_potential", "barrier.image_potential", std::string(to_string(c.model.image)));
    out += line("  ", "relative_permittivity", "barrier.relative_permittivity", number(c.model.relative_permittivity));
    out += line("", "temperature", "temperature", number(c.model.temperature_K) + " K");
    out += line("", "method", "method", std::string(to_string(c.model.method)));
    out += line("", "tolerance", "tolerance", number(c.model.rel_tol));
    out += line("", "bias_limit", "bias_limit", number(c.model.bias_limit_V) + " V");
    out += "geometry:\n";
    out += line("  ", "kind", "geometry.kind", std::string(to_string(c.geometry.kind)));
    out += line("  ", "area", "geometry.area", number(c.geometry.area_m2 * 1e18) + " nm^2");
    const std::string radius = number(c.geometry.apex_radius_m * 1e9) + " nm";
    out += line("  ", "apex_radius", "geometry.apex_radius",
                c.sigma.apex_radius_m > 0 ? fmt::format("{} ± {} nm", radius.substr(0, radius.size() - 3),
                                                        number(c.sigma.apex_radius_m * 1e9))
                                          : radius);
    out += line("  ", "contact_distance", "geometry.contact_distance", number(c.geometry.contact_distance_m * 1e9) + " nm");
    return out;
}

}  // namespace tipgap
