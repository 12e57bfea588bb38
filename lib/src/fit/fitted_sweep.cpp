#include "tipgap/fit/fitted_sweep.hpp"

#include <cmath>

namespace tipgap {

std::vector<fitted_sweep> fit_and_compare(const measured_curve& curve, const fit_options& options,
                                          const config* model_config) {
    std::vector<fit_result> results = fit_curve(curve, options);
    std::vector<fitted_sweep> out;
    // The model at the temperature of the measurement, when the file (or the reader options) state one.
    std::optional<config> at_curve_temperature;
    if (model_config && curve.metadata.temperature_K) {
        at_curve_temperature = *model_config;
        at_curve_temperature->model.temperature_K = *curve.metadata.temperature_K;
        model_config = &*at_curve_temperature;
    }
    for (std::size_t k = 0; k < results.size(); ++k) {
        fitted_sweep f{&curve, &curve.sweeps[k], std::move(results[k]), std::nullopt, ""};
        if (model_config) {
            const double bias = curve.metadata.bias_V ? *curve.metadata.bias_V : std::nan("");
            const location where{curve.file, 0, 0, ""};
            fit_result linear;
            if (f.result.model != fit_model::linear) {
                fit_options lo = options;
                lo.model = fit_model::linear;
                linear = fit_sweep(*f.sweep, bias, lo, where);
            }
            model_fit_options mo;
            mo.confidence_level = options.confidence_level;
            f.model = fit_model_to_sweep(*model_config, *f.sweep, f.result.model == fit_model::linear ? f.result : linear,
                                         bias, mo, where);
        }
        out.push_back(std::move(f));
    }
    return out;
}

}  // namespace tipgap
