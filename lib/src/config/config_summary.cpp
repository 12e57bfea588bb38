#include "tipgap/config/config_summary.hpp"

#include <fmt/format.h>

#include "tipgap/core/constants.hpp"

namespace tipgap {

namespace {

record electrode_record(const electrode& e, double sigma_J) {
    const double eV = si::electron_volt;
    record r;
    r.set("material", e.material);
    r.set("work_function_eV", e.work_function_J / eV);
    r.set("fermi_energy_eV", e.fermi_energy_J / eV);
    if (sigma_J > 0) r.set("work_function_stddev_eV", sigma_J / eV);
    return r;
}

}  // namespace

record config_record(const config& c) {
    record r;
    r.sorted_keys = true;
    r.set("source", c.source);
    r.set("tip", electrode_record(c.model.tip, c.sigma.tip_work_function_J));
    r.set("sample", electrode_record(c.model.sample, c.sigma.sample_work_function_J));
    r.set("image_potential", to_string(c.model.image));
    r.set("relative_permittivity", c.model.relative_permittivity);
    r.set("temperature_K", c.model.temperature_K);
    r.set("method", to_string(c.model.method));
    r.set("tolerance", c.model.rel_tol);
    record g;
    g.set("kind", to_string(c.geometry.kind));
    if (c.geometry.kind == geometry_kind::planar) g.set("area_nm2", c.geometry.area_m2 * 1e18);
    if (c.geometry.kind == geometry_kind::paraboloid) g.set("apex_radius_nm", c.geometry.apex_radius_m * 1e9);
    if (c.geometry.kind == geometry_kind::contact_anchored) g.set("contact_distance_nm", c.geometry.contact_distance_m * 1e9);
    r.set("geometry", g);
    return r;
}

std::string config_line(const config& c) {
    return fmt::format("# {} · T = {} K · image {} · method {} · geometry {}", c.source, c.model.temperature_K,
                       to_string(c.model.image), to_string(c.model.method), to_string(c.geometry.kind));
}

}  // namespace tipgap
