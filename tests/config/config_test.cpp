// Configuration loading: the contract keys, materials defaults, uncertainties and exact errors.
#include <gtest/gtest.h>

#include "tipgap/config/config.hpp"
#include "tipgap/core/constants.hpp"

using namespace tipgap;

namespace {


std::string message_of(const std::string& yaml) {
    try {
        parse_config(yaml, "c.yaml");
    } catch (const error& e) {
        return e.what();
    }
    return "(no error)";
}
}  // namespace

TEST(config, contract_keys) {
    config c = parse_config(R"(
tip:    { material: tungsten, work_function: 4.5 eV, fermi_energy: 9.0 eV }
sample: { material: gold, work_function: 5.3 eV, fermi_energy: 5.5 eV }
barrier: { image_potential: approximate, relative_permittivity: 2 }
temperature: 77 K
method: simmons
tolerance: 1e-8
geometry: { kind: paraboloid, apex_radius: 10 ± 5 nm }
)",
                            "c.yaml");
    EXPECT_NEAR(c.model.tip.work_function_J / eV, 4.5, 1e-14);
    EXPECT_NEAR(c.model.sample.fermi_energy_J / eV, 5.5, 1e-14);
    EXPECT_EQ(c.model.image, image_kind::approximate);
    EXPECT_EQ(c.model.relative_permittivity, 2.0);
    EXPECT_EQ(c.model.temperature_K, 77.0);
    EXPECT_EQ(c.model.method, method_kind::simmons);
    EXPECT_EQ(c.model.rel_tol, 1e-8);
    EXPECT_EQ(c.geometry.kind, geometry_kind::paraboloid);
    EXPECT_NEAR(c.geometry.apex_radius_m, 10e-9, 1e-22);
    EXPECT_NEAR(c.sigma.apex_radius_m, 5e-9, 1e-22);
}

TEST(config, material_fills_defaults_and_explicit_values_override) {
    config c = parse_config("tip: { material: platinum }\nsample: { material: gold, work_function: 5.1 ± 0.1 eV }\n", "c");
    material_entry pt = find_material("platinum");
    EXPECT_EQ(c.model.tip.work_function_J, pt.work_function_J);
    EXPECT_NEAR(c.model.sample.work_function_J / eV, 5.1, 1e-14);
    EXPECT_NEAR(c.sigma.sample_work_function_J / eV, 0.1, 1e-14);
    EXPECT_EQ(c.model.sample.fermi_energy_J, find_material("gold").fermi_energy_J);
    // Every library entry carries its source note.
    for (const auto& m : all_materials()) EXPECT_FALSE(m.source.empty()) << m.name;
}

TEST(config, default_is_the_bundled_file) {
    config c = default_config();
    EXPECT_EQ(c.source, "<default>");
    // Tungsten and gold from the materials library (configs/materials.yaml: 4.55 eV poly W and
    // 5.31 eV Au(111), after Michaelson 1977, from memory), not numbers of its own.
    EXPECT_EQ(c.model.tip.material, "tungsten");
    EXPECT_EQ(c.model.sample.material, "gold");
    EXPECT_NEAR(c.model.tip.work_function_J / eV, 4.55, 1e-14);
    EXPECT_NEAR(c.model.sample.work_function_J / eV, 5.31, 1e-14);
    EXPECT_EQ(c.model.tip.work_function_J, find_material("tungsten").work_function_J);
    EXPECT_EQ(c.model.tip.fermi_energy_J, find_material("tungsten").fermi_energy_J);
    EXPECT_EQ(c.model.sample.work_function_J, find_material("gold").work_function_J);
    EXPECT_EQ(c.model.sample.fermi_energy_J, find_material("gold").fermi_energy_J);
    EXPECT_EQ(c.model.temperature_K, 4.2);
    EXPECT_EQ(c.model.image, image_kind::exact);
    for (const auto& [key, origin] : c.origin) EXPECT_EQ(origin, "built-in default") << key;
    EXPECT_EQ(c.origin.size(), 16u);  // every key of config_yaml
}

TEST(config, errors_name_file_line_column_and_key) {
    EXPECT_EQ(message_of("tip: { work_function: 4.5 eV }\nsample: { work_function: 5 nm }\n"),
              "c.yaml:2:26: sample.work_function: unknown unit 'nm' in '5 nm'; expected an energy in eV, meV, keV, J");
    EXPECT_EQ(message_of("tip: { work_function: 4.5 eV }\nsample: { material: gold }\ncolour: blue\n"),
              "c.yaml:3:1: colour: unknown key; expected one of: name, description, tip, sample, barrier, temperature, "
              "method, tolerance, bias_limit, geometry");
    EXPECT_EQ(message_of("tip: { material: unobtainium }\nsample: { material: gold }\n"),
              "c.yaml:1:18: tip.material: unknown material 'unobtainium'; expected one of the materials library: "
              "tungsten (W), platinum (Pt), platinum_iridium (Pt-Ir, PtIr, Pt/Ir), iridium (Ir), gold (Au), silver (Ag), "
              "copper (Cu), nickel (Ni), graphite (HOPG, C), silicon (Si)");
    EXPECT_EQ(message_of("tip: { material: gold }\nsample: { material: gold }\ntemperature: -3 K\n"),
              "c.yaml:3:14: temperature: -3 K is out of range; expected a temperature in [0, 2000] K");
    EXPECT_EQ(message_of("tip: { material: gold }\nsample: { material: gold }\nbarrier: { relative_permittivity: 0.5 }\n"),
              "c.yaml:3:35: barrier.relative_permittivity: 0.5 is out of range; expected a relative permittivity in "
              "[1, 1000] (1 for vacuum)");
    EXPECT_EQ(message_of("tip: [1, 2]\nsample: { material: gold }\n"),
              "c.yaml:1:6: tip: expected a block of keys (a YAML mapping)");
    EXPECT_EQ(message_of("tip: { material: gold\n"), message_of("tip: { material: gold\n"));  // deterministic
    EXPECT_NE(message_of("tip: { material: gold\n").find("c.yaml:"), std::string::npos);
    EXPECT_EQ(message_of(""),
              "c.yaml: the configuration is empty; expected at least one key (what differs from the built-in default)");
    // A file states only what differs from the built-in default: no block is required.
    EXPECT_EQ(message_of("sample: { material: gold }\n"), "(no error)");
}

TEST(config, a_file_states_only_what_differs_from_the_default) {
    const config d = default_config();
    const config c = parse_config("temperature: 300 K\n", "t.yaml");
    EXPECT_EQ(c.model.temperature_K, 300.0);
    EXPECT_EQ(c.origin.at("temperature"), "t.yaml:1");
    EXPECT_EQ(c.origin.at("tip.work_function"), "built-in default");
    EXPECT_EQ(c.model.tip.work_function_J, d.model.tip.work_function_J);
    EXPECT_EQ(c.model.sample.fermi_energy_J, d.model.sample.fermi_energy_J);
    EXPECT_EQ(c.model.method, d.model.method);
    EXPECT_EQ(c.geometry.area_m2, d.geometry.area_m2);
    // The same as the command line's --temperature 300K over the default.
    config o = default_config();
    junction_overlay t;
    t.temperature_K = 300.0;
    apply_overlay(o, t, "command line");
    EXPECT_EQ(o.model.temperature_K, c.model.temperature_K);
    EXPECT_EQ(o.origin.at("temperature"), "command line");
    // A work function alone makes the electrode custom and keeps the default's Fermi energy.
    const config w = parse_config("tip: { work_function: 4.0 eV }\n", "w.yaml");
    EXPECT_EQ(w.model.tip.material, "");
    EXPECT_NEAR(w.model.tip.work_function_J / eV, 4.0, 1e-14);
    EXPECT_EQ(w.model.tip.fermi_energy_J, d.model.tip.fermi_energy_J);
}

TEST(config, materials_by_symbol_and_common_name_in_any_case) {
    for (const char* n : {"W", "w", "tungsten", "Tungsten"}) EXPECT_EQ(find_material(n).name, "tungsten") << n;
    for (const char* n : {"Au", "AU", "gold"}) EXPECT_EQ(find_material(n).name, "gold") << n;
    for (const char* n : {"Pt-Ir", "PtIr", "ptir", "Pt/Ir", "platinum-iridium", "platinum_iridium"})
        EXPECT_EQ(find_material(n).name, "platinum_iridium") << n;
    for (const char* n : {"HOPG", "hopg", "graphite"}) EXPECT_EQ(find_material(n).name, "graphite") << n;
    // --tip W --sample Au is the default junction.
    config o = default_config();
    junction_overlay j;
    j.tip_material = "W";
    j.sample_material = "Au";
    apply_overlay(o, j, "command line");
    const config d = default_config();
    EXPECT_EQ(o.model.tip.work_function_J, d.model.tip.work_function_J);
    EXPECT_EQ(o.model.tip.fermi_energy_J, d.model.tip.fermi_energy_J);
    EXPECT_EQ(o.model.sample.work_function_J, d.model.sample.work_function_J);
    EXPECT_EQ(o.model.sample.fermi_energy_J, d.model.sample.fermi_energy_J);
    EXPECT_EQ(o.model.tip.material, "tungsten");
    EXPECT_EQ(o.origin.at("tip.material"), "command line");
    // An unknown name is an error naming the key.
    junction_overlay bad;
    bad.sample_material = "unobtainium";
    try {
        apply_overlay(o, bad, "command line");
        ADD_FAILURE() << "no error";
    } catch (const error& e) {
        EXPECT_EQ(e.where().key, "sample.material");
    }
}

TEST(config, shown_yaml_reads_back_as_the_same_config_with_origins) {
    config c = parse_config("tip: { material: PtIr }\nsample: { work_function: 4.61 ± 0.05 eV }\ntemperature: 77 K\n"
                            "geometry: { kind: paraboloid, apex_radius: 20 ± 4 nm }\n",
                            "m.yaml");
    junction_overlay o;
    o.method = method_kind::exact;
    o.image = image_kind::none;
    apply_overlay(c, o, "command line");
    const std::string text = config_yaml(c);
    EXPECT_NE(text.find("temperature: 77 K  # m.yaml:3"), std::string::npos) << text;
    EXPECT_NE(text.find("method: exact  # command line"), std::string::npos) << text;
    EXPECT_NE(text.find("material: platinum_iridium  # m.yaml:1"), std::string::npos) << text;
    EXPECT_NE(text.find("bias_limit: 10 V  # built-in default"), std::string::npos) << text;
    const config r = parse_config(text, "shown.yaml");
    EXPECT_EQ(r.model.tip.material, c.model.tip.material);
    EXPECT_EQ(r.model.sample.material, "");
    for (auto [a, b] : {std::pair{r.model.tip.work_function_J, c.model.tip.work_function_J},
                        {r.model.tip.fermi_energy_J, c.model.tip.fermi_energy_J},
                        {r.model.sample.work_function_J, c.model.sample.work_function_J},
                        {r.model.sample.fermi_energy_J, c.model.sample.fermi_energy_J},
                        {r.sigma.sample_work_function_J, c.sigma.sample_work_function_J},
                        {r.geometry.apex_radius_m, c.geometry.apex_radius_m},
                        {r.sigma.apex_radius_m, c.sigma.apex_radius_m},
                        {r.geometry.area_m2, c.geometry.area_m2},
                        {r.geometry.contact_distance_m, c.geometry.contact_distance_m},
                        {r.model.temperature_K, c.model.temperature_K},
                        {r.model.rel_tol, c.model.rel_tol},
                        {r.model.bias_limit_V, c.model.bias_limit_V},
                        {r.model.relative_permittivity, c.model.relative_permittivity}})
        EXPECT_NEAR(a, b, 1e-13 * std::abs(b));
    EXPECT_EQ(r.model.method, method_kind::exact);
    EXPECT_EQ(r.model.image, image_kind::none);
    EXPECT_EQ(r.geometry.kind, geometry_kind::paraboloid);
}

TEST(config, overlay_text_is_read_with_units_and_names_and_errors_name_the_key) {
    junction_text t;
    t.temperature = "300K";
    t.tip_work_function = "4300 meV";
    t.image = "none";
    t.method = "exact";
    const junction_overlay o = parse_overlay(t);
    EXPECT_EQ(*o.temperature_K, 300.0);
    EXPECT_NEAR(*o.tip_work_function_J / eV, 4.3, 1e-14);
    EXPECT_EQ(*o.image, image_kind::none);
    EXPECT_EQ(*o.method, method_kind::exact);
    EXPECT_FALSE(o.sample_work_function_J.has_value());
    auto key_of = [](junction_text bad) {
        try {
            parse_overlay(bad);
        } catch (const error& e) {
            return e.where().key;
        }
        return std::string("(no error)");
    };
    EXPECT_EQ(key_of({.temperature = "300 nm"}), "temperature");
    EXPECT_EQ(key_of({.sample_work_function = "five"}), "sample.work_function");
    EXPECT_EQ(key_of({.image = "mirror"}), "barrier.image_potential");
    EXPECT_EQ(key_of({.method = "fast"}), "method");
}

// apply_overlay with a namer: each value's origin names the overlay field that set it (the CLI
// passes its flag table, so --show-config says "# command line (--tip)").
TEST(config, overlay_origin_names_the_field_that_set_each_value) {
    config c = default_config();
    junction_overlay o;
    o.tip_material = "Pt";
    o.sample_work_function_J = 4.4 * 1.602176634e-19;
    o.temperature_K = 77.0;
    apply_overlay(c, o, "command line", [](std::string_view field) { return "F:" + std::string(field); });
    EXPECT_EQ(c.origin.at("tip.material"), "command line (F:tip.material)");
    EXPECT_EQ(c.origin.at("tip.fermi_energy"), "command line (F:tip.material)");
    EXPECT_EQ(c.origin.at("sample.work_function"), "command line (F:sample.work_function)");
    EXPECT_EQ(c.origin.at("sample.material"), "command line (F:sample.work_function)");  // now "custom"
    EXPECT_EQ(c.origin.at("temperature"), "command line (F:temperature)");
    EXPECT_TRUE(c.origin.count("method") == 0 || c.origin.at("method").find("command line") == std::string::npos);
    EXPECT_EQ(c.source, "<default> + command line");
}
