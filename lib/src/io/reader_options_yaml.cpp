// Reader options from a small YAML file (load_reader_options, tipgap/io/reader_options.hpp): how
// a file in another layout is to be read, kept beside it (the demo scans use this).
#include <filesystem>
#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include "tipgap/core/error.hpp"
#include "tipgap/core/units.hpp"
#include "tipgap/io/reader_options.hpp"

#include "io/detail/read_capped.hpp"

namespace tipgap {

namespace {

location at(const std::string& file, const YAML::Node& n, const std::string& key) {
    location w{file, 0, 0, key};
    const YAML::Mark m = n.Mark();
    if (m.line >= 0) {
        w.line = m.line + 1;
        w.column = m.column + 1;
    }
    return w;
}

std::string scalar(const std::string& file, const YAML::Node& n, const std::string& key) {
    if (!n.IsScalar()) throw_input(at(file, n, key), "expected a single value, not a block or a list");
    return n.Scalar();
}

// One key of the file into the options.
void read_key(const std::string& file, const std::string& key, const YAML::Node& v, reader_options& o) {
    if (key == "delimiter") {
        if (!from_string(scalar(file, v, key), o.delimiter))
            throw_input(at(file, v, key), fmt::format("{} is not a delimiter; expected {}", quote_input(v.Scalar()),
                                                      accepted_names<delimiter_choice>()));
    } else if (key == "columns") {
        if (!v.IsSequence()) throw_input(at(file, v, key), "expected a list of header names or 1-based indices, e.g. [Z, I]");
        for (const YAML::Node& c : v) o.columns.push_back(scalar(file, c, key));
    } else if (key == "z_unit") {
        o.z_unit = scalar(file, v, key);
    } else if (key == "current_unit") {
        o.current_unit = scalar(file, v, key);
    } else if (key == "xy_unit") {
        o.xy_unit = scalar(file, v, key);
    } else if (key == "flip_z") {
        const std::string s = scalar(file, v, key);
        if (s != "true" && s != "false") throw_input(at(file, v, key), fmt::format("{} is not true or false", quote_input(s)));
        o.flip_z = s == "true";
    } else if (key == "bias") {
        o.bias_V = parse_quantity(scalar(file, v, key), dimension::voltage, at(file, v, key));
    } else if (key == "temperature") {
        o.temperature_K = parse_quantity(scalar(file, v, key), dimension::temperature, at(file, v, key));
    } else {
        throw_input(at(file, v, key.size() > 60 ? key.substr(0, 60) + "..." : key),
                    "unknown key; expected one of: delimiter, columns, z_unit, current_unit, xy_unit, flip_z, bias, "
                    "temperature");
    }
}

}  // namespace

reader_options load_reader_options(const std::string& path) {
    const std::string text = detail::read_capped(path, detail::config_cap_bytes, false, "reader options (YAML)");
    YAML::Node root;
    try {
        root = YAML::Load(text);
    } catch (const YAML::Exception& e) {
        throw_input(location{path, e.mark.line + 1, e.mark.column + 1, ""}, fmt::format("not valid YAML: {}", e.msg));
    }
    reader_options o;
    if (root.IsNull()) return o;
    if (!root.IsMap()) throw_input(at(path, root, ""), "expected a block of keys (a YAML mapping)");
    for (const auto& kv : root) read_key(path, kv.first.Scalar(), kv.second, o);
    return o;
}

}  // namespace tipgap
