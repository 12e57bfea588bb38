#pragma once
// A configuration as output metadata: the record every command's JSON carries under "config".
#include "tipgap/config/config.hpp"
#include "tipgap/io/columns.hpp"

namespace tipgap {

// source, tip and sample (material, work function, Fermi energy, work-function uncertainty when
// given; eV), image potential, relative permittivity, temperature_K, method, tolerance, geometry
// (kind and its size: area_nm2, apex_radius_nm or contact_distance_nm). Keys in byte order.
record config_record(const config& c);

// "# <source> · T = ... K · image ... · method ... · geometry ...": the first line of a table
// (no line break).
std::string config_line(const config& c);

}  // namespace tipgap
