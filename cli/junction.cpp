#include "junction.hpp"

#include <fmt/format.h>

#include "flags.hpp"

namespace tipgap::cli {

namespace {

// The flag behind each config key the overlay set, for --show-config ("# command line (--tip)").
void name_flags(config& c, const junction_text& t) {
    auto flag = [&](const std::string& key) -> std::string {
        const bool tip = key.starts_with("tip."), sample = key.starts_with("sample.");
        if (key == "tip.work_function" && !t.tip_work_function.empty()) return "--tip-work-function";
        if (key == "sample.work_function" && !t.sample_work_function.empty()) return "--sample-work-function";
        if (tip || sample) return tip ? "--tip" : "--sample";
        return key == "temperature" ? "--temperature" : key == "method" ? "--method" : "--image";
    };
    for (auto& [key, origin] : c.origin)
        if (origin == "command line") origin += " (" + flag(key) + ")";
}

}  // namespace

config load_junction(const junction_flags& j) {
    config c = j.config_path.empty() ? default_config() : load_config(j.config_path);
    naming_flags("", flag_error::usage, [&] { apply_overlay(c, parse_overlay(j.text), "command line"); });
    name_flags(c, j.text);
    return c;
}

std::vector<flag> junction_flag_list(junction_flags& j) {
    std::vector<flag> out = {
        {"--config,-c", "Junction configuration (YAML) stating what differs from the built-in default", &j.config_path, "FILE"},
        {"--tip,--tip-material", "Tip material by name or symbol (W, PtIr, Au, ...; default tungsten)", &j.text.tip, "MATERIAL"},
        {"--sample,--sample-material", "Sample material by name or symbol (Au, HOPG, Cu, ...; default gold)", &j.text.sample,
         "MATERIAL"},
        {"--tip-work-function", "Tip work function, e.g. 4.3eV (overrides the material's)", &j.text.tip_work_function, "ENERGY"},
        {"--sample-work-function", "Sample work function, e.g. 4.3eV (overrides the material's)", &j.text.sample_work_function,
         "ENERGY"},
        {"--temperature", "Temperature, e.g. 300K (default 4.2K)", &j.text.temperature, "TEMPERATURE"},
        {"--image", "Image potential: " + accepted_names<image_kind>() + " (default exact)", &j.text.image, "KIND"},
        {"--method", "Transmission: " + accepted_names<method_kind>() + " (default wkb)", &j.text.method, "KIND"},
        {"--show-config", "Print the merged configuration (YAML, each value's origin as a comment) and stop", &j.show},
    };
    out.back().then = [&j] {
        fmt::print("{}", config_yaml(load_junction(j)));
        throw finished{};
    };
    return out;
}

}  // namespace tipgap::cli
