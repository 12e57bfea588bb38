#include "junction.hpp"

#include <fmt/format.h>

#include "flags.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap::cli {

namespace {

template <class E>
std::optional<E> enum_flag(const std::string& text, const char* flag) {
    E e{};
    if (text.empty()) return std::nullopt;
    if (!from_string(text, e))
        throw_usage(flag, fmt::format("{} is not allowed; expected {}", quote_input(text), accepted_names<E>()));
    return e;
}

std::optional<double> quantity_flag(const std::string& text, dimension d, const char* flag) {
    if (text.empty()) return std::nullopt;
    return flag_quantity(text, d, flag);
}

}  // namespace

config load_junction(const junction_flags& j) {
    config c = j.config_path.empty() ? default_config() : load_config(j.config_path);
    junction_overlay o;
    o.tip_material = j.tip;
    o.sample_material = j.sample;
    o.tip_work_function_J = quantity_flag(j.tip_work_function, dimension::energy, "--tip-work-function");
    o.sample_work_function_J = quantity_flag(j.sample_work_function, dimension::energy, "--sample-work-function");
    o.temperature_K = quantity_flag(j.temperature, dimension::temperature, "--temperature");
    o.image = enum_flag<image_kind>(j.image, "--image");
    o.method = enum_flag<method_kind>(j.method, "--method");
    naming_flags("", flag_error::usage, [&] { apply_overlay(c, o, "command line"); });
    return c;
}

std::vector<flag> junction_flag_list(junction_flags& j) {
    std::vector<flag> out = {
        {"--config,-c", "Junction configuration (YAML) stating what differs from the built-in default", &j.config_path, "FILE"},
        {"--tip,--tip-material", "Tip material by name or symbol (W, PtIr, Au, ...; default tungsten)", &j.tip, "MATERIAL"},
        {"--sample,--sample-material", "Sample material by name or symbol (Au, HOPG, Cu, ...; default gold)", &j.sample,
         "MATERIAL"},
        {"--tip-work-function", "Tip work function, e.g. 4.3eV (overrides the material's)", &j.tip_work_function, "ENERGY"},
        {"--sample-work-function", "Sample work function, e.g. 4.3eV (overrides the material's)", &j.sample_work_function,
         "ENERGY"},
        {"--temperature", "Temperature, e.g. 300K (default 4.2K)", &j.temperature, "TEMPERATURE"},
        {"--image", "Image potential: " + accepted_names<image_kind>() + " (default exact)", &j.image, "KIND"},
        {"--method", "Transmission: " + accepted_names<method_kind>() + " (default wkb)", &j.method, "KIND"},
        {"--show-config", "Print the merged configuration (YAML, each value's origin as a comment) and stop", &j.show},
    };
    out.back().then = [&j] {
        fmt::print("{}", config_yaml(load_junction(j)));
        throw finished{};
    };
    return out;
}

}  // namespace tipgap::cli
