#include "tipgap/model.hpp"

#include <cmath>
#include <fmt/format.h>

#include "tipgap/error.hpp"

namespace tipgap {

const char* to_string(image_kind k) {
    switch (k) {
        case image_kind::none: return "none";
        case image_kind::exact: return "exact";
        case image_kind::approximate: return "approximate";
    }
    return "?";
}

const char* to_string(method_kind k) {
    switch (k) {
        case method_kind::wkb: return "wkb";
        case method_kind::simmons: return "simmons";
    }
    return "?";
}

bool from_string(const std::string& s, image_kind& out) {
    for (image_kind k : {image_kind::none, image_kind::exact, image_kind::approximate}) {
        if (s == to_string(k)) {
            out = k;
            return true;
        }
    }
    return false;
}

bool from_string(const std::string& s, method_kind& out) {
    for (method_kind k : {method_kind::wkb, method_kind::simmons}) {
        if (s == to_string(k)) {
            out = k;
            return true;
        }
    }
    return false;
}

namespace {
void require(bool ok, const char* key, const std::string& why) {
    if (!ok) {
        location w;
        w.key = key;
        throw_input(w, why);
    }
}
}  // namespace

void model_options::validate() const {
    constexpr double eV = 1.602176634e-19;
    auto finite = [](double v) { return std::isfinite(v); };
    require(finite(tip.work_function_J) && tip.work_function_J > 0 && tip.work_function_J <= 20 * eV,
            "tip.work_function", "must be in (0, 20] eV");
    require(finite(sample.work_function_J) && sample.work_function_J > 0 && sample.work_function_J <= 20 * eV,
            "sample.work_function", "must be in (0, 20] eV");
    require(finite(tip.fermi_energy_J) && tip.fermi_energy_J > 0 && tip.fermi_energy_J <= 50 * eV,
            "tip.fermi_energy", "must be in (0, 50] eV");
    require(finite(sample.fermi_energy_J) && sample.fermi_energy_J > 0 && sample.fermi_energy_J <= 50 * eV,
            "sample.fermi_energy", "must be in (0, 50] eV");
    require(finite(relative_permittivity) && relative_permittivity >= 1.0 && relative_permittivity <= 1000.0,
            "barrier.relative_permittivity", "must be in [1, 1000] (1 for vacuum)");
    require(finite(temperature_K) && temperature_K >= 0.0 && temperature_K <= 2000.0, "temperature",
            "must be in [0, 2000] K");
    require(finite(rel_tol) && rel_tol >= 1e-12 && rel_tol <= 1e-2, "tolerance", "must be in [1e-12, 1e-2]");
    require(finite(bias_limit_V) && bias_limit_V > 0 && bias_limit_V <= 100.0, "bias_limit",
            "must be in (0, 100] V");
}

}  // namespace tipgap
