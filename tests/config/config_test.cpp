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
    EXPECT_NEAR(c.model.tip.work_function_J / eV, 4.5, 1e-14);
    EXPECT_NEAR(c.model.sample.work_function_J / eV, 5.3, 1e-14);
    EXPECT_EQ(c.model.temperature_K, 4.2);
    EXPECT_EQ(c.model.image, image_kind::exact);
}

TEST(config, errors_name_file_line_column_and_key) {
    EXPECT_EQ(message_of("tip: { work_function: 4.5 eV }\nsample: { work_function: 5 nm }\n"),
              "c.yaml:2:26: sample.work_function: unknown unit 'nm' in '5 nm'; expected an energy in eV, meV, keV, J");
    EXPECT_EQ(message_of("tip: { work_function: 4.5 eV }\nsample: { material: gold }\ncolour: blue\n"),
              "c.yaml:3:1: colour: unknown key; expected one of: name, description, tip, sample, barrier, temperature, "
              "method, tolerance, bias_limit, geometry");
    EXPECT_EQ(message_of("tip: { material: unobtainium }\nsample: { material: gold }\n"),
              "c.yaml:1:18: tip.material: unknown material 'unobtainium'; expected one of the materials library: "
              "tungsten, platinum, platinum_iridium, iridium, gold, silver, copper, nickel, graphite, silicon");
    EXPECT_EQ(message_of("tip: { material: gold }\nsample: { material: gold }\ntemperature: -3 K\n"),
              "c.yaml:3:14: temperature: -3 K is out of range; expected a temperature in [0, 2000] K");
    EXPECT_EQ(message_of("tip: { material: gold }\nsample: { material: gold }\nbarrier: { relative_permittivity: 0.5 }\n"),
              "c.yaml:3:35: barrier.relative_permittivity: 0.5 is out of range; expected a relative permittivity in "
              "[1, 1000] (1 for vacuum)");
    EXPECT_EQ(message_of("tip: [1, 2]\nsample: { material: gold }\n"),
              "c.yaml:1:6: tip: expected a block of keys (a YAML mapping)");
    EXPECT_EQ(message_of("tip: { material: gold\n"), message_of("tip: { material: gold\n"));  // deterministic
    EXPECT_NE(message_of("tip: { material: gold\n").find("c.yaml:"), std::string::npos);
    EXPECT_EQ(message_of(""), "c.yaml: the configuration is empty; expected at least a tip and a sample block");
    EXPECT_EQ(message_of("sample: { material: gold }\n"),
              "c.yaml:1:1: tip: the tip block is missing; expected a tip block (material or work_function)");
}
