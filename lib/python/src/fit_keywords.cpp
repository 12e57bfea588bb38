#include "fit_keywords.hpp"

#include <fmt/format.h>
#include <string>

#include "keywords.hpp"

namespace tipgap::python {

namespace py = pybind11;

fit_options fit_options_from(const py::dict& k, const char* function) {
    fit_options o;
    auto given = [&](const char* key) { return k.contains(key) && !k[key].is_none(); };
    auto number = [&](const char* key) { return py::cast<double>(k[key]); };
    if (given("model")) {
        const std::string model = py::cast<std::string>(k["model"]);
        if (!from_string(model, o.model))
            throw_input(location{"", 0, 0, "model"}, fmt::format("expected linear or offset, got {}", quote_input(model)));
    }
    if (given("noise_floor_A")) o.noise_floor_A = number("noise_floor_A");
    if (given("saturation_A")) o.saturation_A = number("saturation_A");
    if (given("current_noise_A")) o.current_noise_A = number("current_noise_A");
    if (given("calibration_uncertainty")) o.calibration_uncertainty = number("calibration_uncertainty");
    if (given("confidence")) o.confidence_level = number("confidence");
    if (given("contact_distance_nm")) o.contact_distance_m = number("contact_distance_nm") * 1e-9;
    if (given("window_points") && given("window_nm"))
        throw_input(location{"", 0, 0, "window_points"}, "both window_points and window_nm given; expected one of them");
    if (given("window_points")) {
        const long n = py::cast<long>(k["window_points"]);
        if (n < 0) throw_input(location{"", 0, 0, "window_points"}, fmt::format("{} is not a number of points", n));
        o.window_points = static_cast<std::size_t>(n);
    }
    if (given("window_nm")) o.window_m = number("window_nm") * 1e-9;
    naming_keywords(function, [&] { o.validate(); });
    return o;
}

}  // namespace tipgap::python
