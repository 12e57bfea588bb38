#include "tipgap/plan/warnings.hpp"

#include <fmt/format.h>

namespace tipgap {

std::vector<std::string> operating_warnings(double gap_m, double bias_V, double conductance_G0, regime kind) {
    std::vector<std::string> w;
    if (gap_m < near_contact_gap_m || conductance_G0 > near_contact_conductance_G0) {
        w.push_back(fmt::format("near contact: gap {:.3g} nm, conductance {:.3g} G0 (limits 0.35 nm, 0.01 G0); "
                                "risk of a tip crash",
                                gap_m * 1e9, conductance_G0));
    }
    if (kind == regime::field_emission) {
        w.push_back(fmt::format("field-emission regime: |eV| = {:.3g} eV exceeds the barrier; high voltage on the "
                                "tip, follow the lab's safety rules and the instrument manual",
                                std::abs(bias_V)));
    }
    if (kind == regime::barrier_collapsed) {
        w.push_back("barrier collapsed: the image-lowered barrier top is below the emitting Fermi level; the planar "
                    "tunnelling model does not apply here");
    }
    return w;
}

}  // namespace tipgap
