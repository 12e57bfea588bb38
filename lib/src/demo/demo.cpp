// tipgap demo, the computation: predict over a gap sweep, fit the demo curves, compare with truth.
#include "tipgap/demo/demo.hpp"

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include "core/detail/parallel.hpp"
#include "io/detail/read_capped.hpp"

namespace tipgap {
namespace {

// The z(V) traces in <scans>/resonances/ with their resonance analysis against their truth.
std::vector<demo_resonance> demo_resonances(const config& c, const std::string& scans, int threads) {
    namespace fs = std::filesystem;
    std::vector<demo_resonance> out;
    const fs::path dir = fs::path(scans) / "resonances";
    std::error_code ec;
    if (!fs::is_directory(dir, ec)) return out;
    std::vector<std::string> files;
    for (const fs::directory_entry& e : fs::directory_iterator(dir)) {
        if (e.is_regular_file() && e.path().extension() == ".csv") files.push_back(e.path().string());
    }
    std::sort(files.begin(), files.end());
    resonance_options ro;
    ro.threads = threads;
    for (const std::string& f : files) {
        demo_resonance d;
        d.trace = std::make_shared<const bias_trace>(read_bias_trace(f));
        d.result = analyse_resonances(c, *d.trace, ro);
        const std::string tp = truth_path_for(f);
        if (fs::exists(tp)) d.truth = read_zv_truth(tp);
        if (d.truth) {
            const double w = d.truth->sample_work_function_J;
            d.work_function_within = w >= d.result.work_function_ci_low_J && w <= d.result.work_function_ci_high_J;
            for (std::size_t k = 0; k < d.result.peaks.size() && k < d.truth->peaks_V.size(); ++k) {
                d.largest_peak_error_V =
                    std::max(d.largest_peak_error_V, std::abs(d.result.peaks[k].bias_V - d.truth->peaks_V[k]));
            }
        }
        out.push_back(std::move(d));
    }
    return out;
}

}  // namespace

namespace {

// The reader options of a demo curve: its <stem>.read.yaml, or the defaults.
reader_options reader_options_for(const std::string& curve_file) {
    const std::filesystem::path p(curve_file);
    const std::string path = (p.parent_path() / (p.stem().string() + ".read.yaml")).string();
    std::error_code ec;
    if (!std::filesystem::exists(path, ec)) return {};
    reader_options o = load_reader_options(path);
    try {
        o.validate(2);
    } catch (const error& e) {
        throw_input(location{path, 0, 0, e.where().key}, e.detail());
    }
    return o;
}

// The fit model of a demo curve: `model:` in its <stem>.fit.yaml, or the linear model (the
// estimand of the synthesiser's expected κ; see below).
fit_options fit_options_for(const std::string& curve_file) {
    const std::filesystem::path p(curve_file);
    const std::string path = (p.parent_path() / (p.stem().string() + ".fit.yaml")).string();
    fit_options o{.model = fit_model::linear};
    std::error_code ec;
    if (!std::filesystem::exists(path, ec)) return o;
    const std::string text = detail::read_capped(path, detail::config_cap_bytes, false, "fit options (YAML)");
    YAML::Node root;
    try {
        root = YAML::Load(text);
    } catch (const YAML::Exception& e) {
        throw_input(location{path, e.mark.line + 1, e.mark.column + 1, ""}, fmt::format("not valid YAML: {}", e.msg));
    }
    if (root.IsNull()) return o;
    if (!root.IsMap()) throw_input(location{path, 1, 1, ""}, "expected a block of keys (a YAML mapping)");
    for (const auto& kv : root) {
        const YAML::Mark m = kv.second.Mark();
        const std::string key = kv.first.Scalar();
        const location where{path, m.line + 1, m.column + 1, key.size() > 60 ? key.substr(0, 60) + "..." : key};
        if (key != "model") throw_input(where, "unknown key; expected: model");
        if (!kv.second.IsScalar()) throw_input(where, "expected a single value, not a block or a list");
        if (!from_string(kv.second.Scalar(), o.model))
            throw_input(where, fmt::format("{} is not a fit model; expected {}", quote_input(kv.second.Scalar()),
                                           accepted_names<fit_model>()));
    }
    return o;
}

// The truth of κ for the fit's model: the linear model's estimand is the expected κ (the
// weighted line of the noise-free recorded current, baseline and drift included); the offset
// model removes the baseline, so its estimand is the model's own κ over the same points.
double truth_decay_for(const demo_curve& d) {
    return d.fit.model == fit_model::linear ? d.sweep_truth->decay_constant_expected_per_m
                                            : d.sweep_truth->decay_constant_model_per_m;
}

// The curve files (*.csv, *.tsv, *.txt) of the demo scans directory, in name order; throws
// tipgap::error (input) when the directory is missing or holds none.
std::vector<std::string> demo_curve_files(const std::string& scans_dir) {
    namespace fs = std::filesystem;
    std::error_code ec;
    if (!fs::is_directory(scans_dir, ec))
        throw_input(location{scans_dir, 0, 0, ""}, "the demo scans directory does not exist (use --scans DIR)");
    std::vector<std::string> files;
    for (const fs::directory_entry& e : fs::directory_iterator(scans_dir)) {
        const std::string ext = e.path().extension().string();
        if (e.is_regular_file() && (ext == ".csv" || ext == ".tsv" || ext == ".txt")) files.push_back(e.path().string());
    }
    std::sort(files.begin(), files.end());
    if (files.empty()) throw_input(location{scans_dir, 0, 0, ""}, "no curve files (*.csv, *.tsv, *.txt) in the demo scans directory");
    return files;
}

}  // namespace

demo_report run_demo(const demo_options& o) {
    namespace fs = std::filesystem;
    demo_report rep;
    rep.cfg = default_config();
    if (!(o.gap_min_m > 0 && o.gap_max_m > o.gap_min_m && o.gap_points >= 2 && o.gap_points <= 10000))
        throw_input(location{"", 0, 0, "gap sweep"}, "expected 0 < gap_min < gap_max and 2..10000 points");
    std::vector<std::pair<double, double>> pts;
    for (int k = 0; k < o.gap_points; ++k)
        pts.emplace_back(o.gap_min_m + (o.gap_max_m - o.gap_min_m) * k / (o.gap_points - 1), o.bias_V);
    rep.sweep = predict_points(rep.cfg, pts, o.threads);

    // The setpoint ladder a newcomer would try first: one current per decade at the sweep's bias.
    std::vector<std::pair<double, double>> ladder;
    for (double current : {10e-12, 100e-12, 1e-9, 10e-9}) ladder.emplace_back(current, o.bias_V);
    rep.plan = plan_setpoints(rep.cfg, ladder, plan_options{}, o.threads);

    const std::vector<std::string> files = demo_curve_files(o.scans_dir);

    // `tipgap fit FILE --model linear` unless the file's <stem>.fit.yaml names another model: the
    // synthesiser's expected κ is the I²-weighted line of the noise-free curve, which is the
    // linear model's estimand. These curves come from the WKB model with the image potential, so
    // ln|I| is curved and κ depends on the weighting: the default offset model (weights from its
    // noise model) flags the curvature and lands ~0.1-0.7 % away (tests/demo/demo_scans_test.cpp).
    for (const std::string& f : files) {
        const reader_options read = reader_options_for(f);
        const fit_options fo = fit_options_for(f);
        auto curve = std::make_shared<const measured_curve>(read_curve_csv(f, read));
        std::optional<truth_record> truth;
        const std::string tp = truth_path_for(f);
        if (fs::exists(tp)) truth = read_truth(tp);
        else rep.files_without_truth.push_back(f);
        std::vector<fit_result> fits = fit_curve(*curve, fo);
        for (std::size_t k = 0; k < fits.size(); ++k) {
            demo_curve d;
            d.curve = curve;
            d.read = read;
            d.sweep_index = k;
            d.fit = std::move(fits[k]);
            d.truth = truth;
            if (truth && k < truth->sweeps.size() && truth->sweeps[k].direction == d.fit.direction)
                d.sweep_truth = truth->sweeps[k];
            rep.curves.push_back(std::move(d));
        }
    }

    // The model comparisons are independent and the slow part: one worker per sweep.
    detail::parallel_for(rep.curves.size(), o.model_comparison ? o.threads : 1, [&](std::size_t i) {
        demo_curve& d = rep.curves[i];
        // The model comparison fits no current offset: an offset-model curve would bias it.
        if (o.model_comparison && d.fit.model == fit_model::linear) {
            const double bias = d.curve->metadata.bias_V ? *d.curve->metadata.bias_V : std::nan("");
            config at_temperature = rep.cfg;  // the model at the measurement's temperature (fit_and_compare)
            if (d.curve->metadata.temperature_K) at_temperature.model.temperature_K = *d.curve->metadata.temperature_K;
            // The model comparison takes its points and weights from the linear fit.
            const location where{d.curve->file, 0, 0, ""};
            d.model = fit_model_to_sweep(at_temperature, d.sweep(), d.fit, bias, model_fit_options{}, where);
        }
        if (d.sweep_truth) {
            d.truth_decay_constant_per_m = truth_decay_for(d);
            const double k = d.truth_decay_constant_per_m;
            d.kappa_within = k >= d.fit.decay_constant_ci_low_per_m && k <= d.fit.decay_constant_ci_high_per_m;
        }
        if (d.truth && d.fit.model == fit_model::offset) {
            const double half = d.fit.t_quantile * d.fit.offset_stderr_A;
            d.offset_within = std::abs(d.fit.offset_A - d.truth->baseline_A) <= half;
        }
        if (d.model && d.truth) {
            const double half = d.model->t_quantile * d.model->mean_work_function_stderr_J;
            d.work_function_within = std::abs(d.model->mean_work_function_J - d.truth->mean_work_function_J) <= half;
        }
    });
    if (o.resonances) rep.resonances = demo_resonances(rep.cfg, o.scans_dir, o.threads);
    return rep;
}

}  // namespace tipgap
