#include "tipgap/config/config.hpp"

#include "io/detail/read_capped.hpp"

#include <algorithm>
#include <cstdint>
#include <filesystem>
#include <fmt/format.h>
#include <fmt/ranges.h>
#include <fstream>
#include <initializer_list>
#include <sstream>
#include <yaml-cpp/yaml.h>

#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap {
namespace embedded {
extern const char* const materials_yaml;
extern const char* const default_yaml;
}  // namespace embedded

namespace {

struct reader {
    std::string file;

    location at(const YAML::Node& n, const std::string& key) const {
        location w;
        w.file = file;
        if (n.IsDefined()) {
            auto m = n.Mark();
            if (m.line >= 0) {
                w.line = m.line + 1;
                w.column = m.column + 1;
            }
        }
        w.key = key;
        return w;
    }

    void require_map(const YAML::Node& n, const std::string& key) const {
        if (!n.IsMap()) throw_input(at(n, key), "expected a block of keys (a YAML mapping)");
    }

    // Every key must be a plain name, appear once, and be one of `allowed`. (yaml-cpp keeps the
    // first of two equal keys and drops the second silently; a config that says `tip:` twice is a
    // mistake the user must hear about.)
    void check_keys(const YAML::Node& n, const std::string& prefix, std::initializer_list<const char*> allowed) const {
        std::vector<std::string> seen;
        for (const auto& kv : n) {
            if (!kv.first.IsScalar()) {
                throw_input(at(kv.first, prefix.empty() ? "(top level)" : prefix),
                            "this key is not a plain name; expected a name such as 'tip'");
            }
            std::string k = kv.first.Scalar();
            std::string path = prefix.empty() ? k : prefix + "." + k;
            bool ok = false;
            for (const char* a : allowed) ok = ok || k == a;
            if (!ok) {
                std::string list;
                for (const char* a : allowed) list += (list.empty() ? "" : ", ") + std::string(a);
                // The key goes into the location (clipped: it is the user's text, maybe a whole line).
                const std::string shown = k.size() > 60 ? k.substr(0, 60) + "..." : k;
                throw_input(at(kv.first, prefix.empty() ? shown : prefix + "." + shown),
                            fmt::format("unknown key; expected one of: {}", list));
            }
            for (const auto& s : seen) {
                if (s == k) throw_input(at(kv.first, path), "the key appears twice; expected each key once");
            }
            seen.push_back(k);
        }
    }

    std::string scalar(const YAML::Node& n, const std::string& key) const {
        if (n.IsNull()) throw_input(at(n, key), "the value is missing; expected a single value after the colon");
        if (!n.IsScalar()) throw_input(at(n, key), "expected a single value, not a block or a list");
        return n.Scalar();
    }

    double quantity(const YAML::Node& n, const std::string& key, dimension d) const {
        return parse_quantity(scalar(n, key), d, at(n, key));
    }

    uncertain uncertain_quantity(const YAML::Node& n, const std::string& key, dimension d) const {
        return parse_uncertain(scalar(n, key), d, at(n, key));
    }
};

// "file:line" of a key's value, for config::origin.
std::string origin_of(const reader& r, const YAML::Node& n) {
    return n.IsDefined() && n.Mark().line >= 0 ? fmt::format("{}:{}", r.file, n.Mark().line + 1) : r.file;
}

// A block of an electrode over the base's values: a material sets both energies from the library;
// a work function alone makes the electrode custom.
void read_electrode(const reader& r, const YAML::Node& n, const std::string& key, config& c, electrode& e, double& sigma) {
    r.require_map(n, key);
    r.check_keys(n, key, {"material", "work_function", "fermi_energy"});
    if (n["material"]) {
        material_entry m = find_material(r.scalar(n["material"], key + ".material"), r.at(n["material"], key + ".material"));
        e.material = m.name;
        e.work_function_J = m.work_function_J;
        e.fermi_energy_J = m.fermi_energy_J;
        sigma = 0;
        for (const char* k : {".material", ".work_function", ".fermi_energy"}) c.origin[key + k] = origin_of(r, n["material"]);
    }
    if (n["work_function"]) {
        uncertain u = r.uncertain_quantity(n["work_function"], key + ".work_function", dimension::energy);
        e.work_function_J = u.value;
        sigma = u.sigma;
        c.origin[key + ".work_function"] = origin_of(r, n["work_function"]);
        if (!n["material"]) {
            e.material.clear();
            c.origin[key + ".material"] = c.origin[key + ".work_function"];
        }
    }
    if (n["fermi_energy"]) {
        e.fermi_energy_J = r.quantity(n["fermi_energy"], key + ".fermi_energy", dimension::energy);
        c.origin[key + ".fermi_energy"] = origin_of(r, n["fermi_energy"]);
    }
}

// Re-throws a range error from validate() with the file and the key's line.
template <class F>
void validate_at(const reader& r, const YAML::Node& root, F&& f) {
    try {
        f();
    } catch (const error& e) {
        const std::string& key = e.where().key;
        std::size_t start = 0;
        std::vector<std::string> parts;
        while (start <= key.size()) {
            std::size_t dot = key.find('.', start);
            parts.push_back(key.substr(start, dot == std::string::npos ? std::string::npos : dot - start));
            if (dot == std::string::npos) break;
            start = dot + 1;
        }
        // yaml-cpp's operator= on a Node assigns content; reset() rebinds, which is what a walk needs.
        YAML::Node cur;
        cur.reset(root);
        bool ok = true;
        for (const auto& p : parts) {
            const YAML::Node& view = cur;
            if (!view.IsMap() || !view[p]) {
                ok = false;
                break;
            }
            cur.reset(view[p]);
        }
        location w = ok ? r.at(cur, key) : r.at(YAML::Node(), key);
        if (!ok) w.file = r.file;
        throw error(e.kind(), w, e.detail());
    }
}

// An enum value by its name, or an error listing the names.
template <class E>
void read_enum(const reader& r, const YAML::Node& n, const std::string& key, const char* what, E& out) {
    const std::string v = r.scalar(n, key);
    if (!from_string(v, out))
        throw_input(r.at(n, key), fmt::format("{} is not {}; expected {}", quote_input(v), what, accepted_names<E>()));
}

void read_geometry(const reader& r, const YAML::Node& g, config& c) {
    r.require_map(g, "geometry");
    r.check_keys(g, "geometry", {"kind", "area", "apex_radius", "contact_distance"});
    if (g["kind"]) read_enum(r, g["kind"], "geometry.kind", "a geometry", c.geometry.kind);
    if (g["area"]) c.geometry.area_m2 = r.quantity(g["area"], "geometry.area", dimension::area);
    if (g["apex_radius"]) {
        uncertain u = r.uncertain_quantity(g["apex_radius"], "geometry.apex_radius", dimension::length);
        c.geometry.apex_radius_m = u.value;
        c.sigma.apex_radius_m = u.sigma;
    }
    if (g["contact_distance"])
        c.geometry.contact_distance_m = r.quantity(g["contact_distance"], "geometry.contact_distance", dimension::length);
    for (const char* k : {"kind", "area", "apex_radius", "contact_distance"})
        if (g[k]) c.origin[std::string("geometry.") + k] = origin_of(r, g[k]);
}

// The keys of `root` over `base` (the built-in default, or an empty config for the default itself).
config parse_root(const YAML::Node& root, const std::string& name, config c) {
    reader r{name};
    c.source = name;
    if (!root.IsDefined() || root.IsNull())
        throw_input(r.at(YAML::Node(), ""), "the configuration is empty; expected at least one key (what differs from the built-in default)");
    r.require_map(root, "(top level)");
    r.check_keys(root, "", {"name", "description", "tip", "sample", "barrier", "temperature", "method", "tolerance",
                            "bias_limit", "geometry"});
    if (root["tip"]) read_electrode(r, root["tip"], "tip", c, c.model.tip, c.sigma.tip_work_function_J);
    if (root["sample"]) read_electrode(r, root["sample"], "sample", c, c.model.sample, c.sigma.sample_work_function_J);
    if (auto b = root["barrier"]) {
        r.require_map(b, "barrier");
        r.check_keys(b, "barrier", {"image_potential", "relative_permittivity"});
        if (b["image_potential"]) read_enum(r, b["image_potential"], "barrier.image_potential", "an image potential", c.model.image);
        if (b["relative_permittivity"]) {
            c.model.relative_permittivity =
                r.quantity(b["relative_permittivity"], "barrier.relative_permittivity", dimension::dimensionless);
        }
        for (const char* k : {"image_potential", "relative_permittivity"})
            if (b[k]) c.origin[std::string("barrier.") + k] = origin_of(r, b[k]);
    }
    if (root["temperature"]) c.model.temperature_K = r.quantity(root["temperature"], "temperature", dimension::temperature);
    if (root["method"]) read_enum(r, root["method"], "method", "a method", c.model.method);
    if (root["tolerance"]) c.model.rel_tol = r.quantity(root["tolerance"], "tolerance", dimension::dimensionless);
    if (root["bias_limit"]) c.model.bias_limit_V = r.quantity(root["bias_limit"], "bias_limit", dimension::voltage);
    for (const char* k : {"temperature", "method", "tolerance", "bias_limit"})
        if (root[k]) c.origin[k] = origin_of(r, root[k]);
    if (auto g = root["geometry"]) read_geometry(r, g, c);
    validate_at(r, root, [&] { c.model.validate(); });
    validate_at(r, root, [&] { c.geometry.validate(); });
    return c;
}

// The 1-based line of a "---" that starts a second document (one after any content), or 0.
int second_document_line(std::string_view text) {
    bool content = false;
    int line = 0;
    for (std::size_t i = 0; i < text.size();) {
        std::size_t end = text.find('\n', i);
        if (end == std::string_view::npos) end = text.size();
        const std::string_view l = text.substr(i, end - i);
        ++line;
        i = end + 1;
        const bool separator = l.substr(0, 3) == "---" && (l.size() == 3 || l[3] == ' ' || l[3] == '\t' || l[3] == '\r');
        if (separator && content) return line;
        const std::size_t first = l.find_first_not_of(" \t\r");
        if (!separator && first != std::string_view::npos && l[first] != '#' && l[first] != '%') content = true;
    }
    return 0;
}

YAML::Node load_yaml(std::string_view text, const std::string& name) {
    try {
        // A second document ("---" and more keys) would be dropped silently by YAML::Load. (Not
        // YAML::LoadAll: it loops forever on some malformed input, found by fuzz_config.)
        if (const int line = second_document_line(text); line > 0)
            throw_input(location{name, line, 1, ""}, "a second YAML document starts here; expected one configuration "
                                                     "(remove the '---' separator and merge the keys)");
        return YAML::Load(std::string(text));
    } catch (const YAML::ParserException& e) {
        location w;
        w.file = name;
        w.line = e.mark.line + 1;
        w.column = e.mark.column + 1;
        // YAML forbids tabs in indentation, and yaml-cpp then reports a confusing "end of map not
        // found" further on: name the first tab-indented line instead.
        int line = 1;
        for (std::size_t i = 0; i < text.size(); ++line) {
            std::size_t end = text.find('\n', i);
            if (end == std::string_view::npos) end = text.size();
            std::string_view l = text.substr(i, end - i);
            std::size_t lead = l.find_first_not_of(" \t");
            std::size_t tab = l.find('\t');
            if (tab != std::string_view::npos && (lead == std::string_view::npos || tab < lead) && line <= w.line) {
                throw_input(location{name, line, static_cast<int>(tab) + 1, ""},
                            "not valid YAML: a tab in the indentation; expected spaces (YAML indents with spaces only)");
            }
            i = end + 1;
        }
        throw_input(w, fmt::format("not valid YAML: {}; expected YAML such as 'tip: {{material: tungsten}}' (check "
                                   "brackets, quotes and indentation)",
                                   e.msg));
    }
}

// The built-in default: configs/default.yaml over an empty config, every origin "built-in default".
const config& builtin_default() {
    static const config c = [] {
        config d = parse_root(load_yaml(embedded::default_yaml, "<default>"), "<default>", config{});
        for (auto& [key, where] : d.origin) where = "built-in default";
        return d;
    }();
    return c;
}

config parse_over(std::string_view text, const std::string& name, const config& base) {
    try {
        return parse_root(load_yaml(text, name), name, base);
    } catch (const YAML::Exception& e) {
        location w;
        w.file = name;
        if (e.mark.line >= 0) {
            w.line = e.mark.line + 1;
            w.column = e.mark.column + 1;
        }
        throw_input(w, fmt::format("cannot read the configuration: {}", e.msg));
    }
}

}  // namespace

config parse_config(std::string_view text, const std::string& name) { return parse_over(text, name, builtin_default()); }

config load_config(const std::string& path) {
    // A configuration is a few hundred bytes. yaml-cpp builds a node tree of many times the file's
    // size, so a file far beyond any configuration (a data file given by mistake, /dev/zero) is
    // refused first.
    return parse_config(detail::read_capped(path, detail::config_cap_bytes, false, "a configuration"), path);
}

config default_config() { return builtin_default(); }

std::vector<material_entry> all_materials() {
    static const std::vector<material_entry> list = [] {
        std::vector<material_entry> out;
        YAML::Node root = YAML::Load(embedded::materials_yaml);
        for (const auto& kv : root["materials"]) {
            material_entry m;
            m.name = kv.first.Scalar();
            m.work_function_J = parse_quantity(kv.second["work_function"].Scalar(), dimension::energy);
            m.fermi_energy_J = parse_quantity(kv.second["fermi_energy"].Scalar(), dimension::energy);
            m.source = kv.second["source"].Scalar();
            if (const YAML::Node a = kv.second["aliases"])
                for (const auto& x : a) m.aliases.push_back(x.Scalar());
            out.push_back(m);
        }
        return out;
    }();
    return list;
}

namespace {
// "Pt-Ir" -> "ptir": lower case without '-', '_', '/' and spaces.
std::string material_key(std::string_view name) {
    std::string out;
    for (char ch : name) {
        if (ch == '-' || ch == '_' || ch == '/' || ch == ' ') continue;
        out += (ch >= 'A' && ch <= 'Z') ? static_cast<char>(ch - 'A' + 'a') : ch;
    }
    return out;
}
}  // namespace

material_entry find_material(const std::string& name, const location& where) {
    std::string names;
    const std::string key = material_key(name);
    for (const auto& m : all_materials()) {
        if (material_key(m.name) == key) return m;
        for (const auto& a : m.aliases)
            if (material_key(a) == key) return m;
        names += (names.empty() ? "" : ", ") + m.name;
        if (!m.aliases.empty()) names += fmt::format(" ({})", fmt::join(m.aliases, ", "));
    }
    throw_input(where, fmt::format("unknown material {}; expected one of the materials library: {}", quote_input(name), names));
}

}  // namespace tipgap
