// Building the three-panel figure of a fitted sweep (see fit_plot.hpp).
#include "tipgap/figures/fit_plot.hpp"

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fmt/format.h>
#include <map>
#include <numbers>

#include "figures/detail/current_unit.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/io/columns.hpp"

namespace tipgap {
namespace {

constexpr double per_nm = 1e9;
constexpr std::size_t band_points = 101;
constexpr double ln10 = std::numbers::ln10;

// The fitted curve and its bands, in ln(|I| / 1 A), over the used z range.
struct fitted_curve {
    std::vector<double> z_m, ln_fit, confidence_half, prediction_half;
};

// ln|I| of the fitted model at z. The offset model fits the current with the sign of the signal;
// offset_A carries the sign of the current, so |I| = I0 e^(-2κ(z - z_ref)) + sign · offset.
double fitted_ln(const fit_result& fit, double sign, double z) {
    if (fit.model == fit_model::offset) {
        const double i = fit.prefactor_A * std::exp(-2.0 * fit.decay_constant_per_m * (z - fit.z_ref_m)) + sign * fit.offset_A;
        return i > 0 ? std::log(i) : NAN;
    }
    return fit.line.intercept + fit.line.slope * z;
}

double signal_sign(const curve_sweep& sweep, const fit_result& fit) {
    double sign_sum = 0.0;
    for (std::size_t i : fit.used_rows) sign_sum += sweep.current_A[i];
    return sign_sum < 0.0 ? -1.0 : 1.0;
}

// Bands of the offset model at z, in ln|I|: the fitted current's variance gᵀCg from the parameter
// covariance C of (I0, 2κ, c) with g = ∂I/∂(I0, 2κ, c) (first-order propagation), over I²; the
// band of the points adds the noise model's variance σ_I² + (ε μ)² over I².
void offset_bands(const fit_result& fit, double sign, double z, fitted_curve& c) {
    const std::vector<double>& cv = fit.parameter_covariance;
    const double x = z - fit.z_ref_m;
    const double e = std::exp(-2.0 * fit.decay_constant_per_m * x);
    const double mu = fit.prefactor_A * e, i = mu + sign * fit.offset_A;
    if (cv.size() != 9 || !(i > 0.0)) {
        c.confidence_half.push_back(NAN);
        c.prediction_half.push_back(NAN);
        return;
    }
    const double g[3] = {e, -fit.prefactor_A * x * e, 1.0};
    double var = 0.0;
    for (int a = 0; a < 3; ++a)
        for (int b = 0; b < 3; ++b) var += g[a] * cv[static_cast<std::size_t>(3 * a + b)] * g[b];
    const double noise = fit.current_noise_A * fit.current_noise_A + fit.relative_noise * fit.relative_noise * mu * mu;
    c.confidence_half.push_back(fit.t_quantile * std::sqrt(std::max(var, 0.0)) / i);
    c.prediction_half.push_back(fit.t_quantile * std::sqrt(std::max(var, 0.0) + noise) / i);
}

// Bands of the linear model. The confidence band of the
// mean is t·sqrt(var(a + b z)) from the line's covariance; the band expected to hold 95 % of the
// points adds the scatter of the points about the line, taken as the RMS residual in ln|I| (the
// usual prediction interval of a straight-line fit, e.g. Draper & Smith, Applied Regression
// Analysis, 3rd ed., eq. 1.4.7, with s replaced by the unweighted RMS so that it holds for
// weighted fits too).
fitted_curve fitted_with_bands(const curve_sweep& sweep, const fit_result& fit) {
    double z_lo = INFINITY, z_hi = -INFINITY;
    for (std::size_t i : fit.used_rows) {
        z_lo = std::min(z_lo, sweep.z_m[i]);
        z_hi = std::max(z_hi, sweep.z_m[i]);
    }
    const double sign = signal_sign(sweep, fit);
    fitted_curve c;
    for (std::size_t k = 0; k < band_points && z_hi >= z_lo; ++k) {
        const double z = z_lo + (z_hi - z_lo) * static_cast<double>(k) / (band_points - 1);
        c.z_m.push_back(z);
        c.ln_fit.push_back(fitted_ln(fit, sign, z));
        if (fit.model != fit_model::linear) {
            offset_bands(fit, sign, z, c);
            continue;
        }
        const double var = fit.line.intercept_stderr * fit.line.intercept_stderr +
                           z * z * fit.line.slope_stderr * fit.line.slope_stderr + 2.0 * z * fit.line.covariance;
        c.confidence_half.push_back(fit.t_quantile * std::sqrt(std::max(var, 0.0)));
        c.prediction_half.push_back(fit.t_quantile * std::sqrt(std::max(var, 0.0) + fit.residual_rms_ln * fit.residual_rms_ln));
    }
    return c;
}

// Bands around `centre` (per point of c; log10 units): the wide grey one under the narrow tint.
std::vector<plot::band> bands_about(const fitted_curve& c, const std::vector<double>& centre, double level) {
    if (c.confidence_half.empty()) return {};
    plot::band wide{{}, {}, {}, fmt::format("{:.0f} % of points", 100.0 * level), 1, plot::band_fill::grey};
    plot::band narrow{{}, {}, {}, fmt::format("{:.0f} % confidence of the fit", 100.0 * level), 1, plot::band_fill::tint};
    for (std::size_t k = 0; k < c.z_m.size(); ++k) {
        // Where the fitted current is not positive (an offset below zero, far out) there is no
        // ln|I| and no band.
        if (!std::isfinite(centre[k]) || !std::isfinite(c.prediction_half[k]) || !std::isfinite(c.confidence_half[k])) continue;
        const double x = c.z_m[k] * per_nm;
        wide.x.push_back(x);
        narrow.x.push_back(x);
        wide.y_low.push_back(centre[k] - c.prediction_half[k] / ln10);
        wide.y_high.push_back(centre[k] + c.prediction_half[k] / ln10);
        narrow.y_low.push_back(centre[k] - c.confidence_half[k] / ln10);
        narrow.y_high.push_back(centre[k] + c.confidence_half[k] / ln10);
    }
    if (wide.x.empty()) return {};
    return {wide, narrow};
}

// The unit of the current axis: from the largest |I| drawn.
figures_detail::current_unit_choice unit_for(const curve_sweep& sweep) {
    double m = 0.0;
    for (double I : sweep.current_A)
        if (std::isfinite(I)) m = std::max(m, std::abs(I));
    return figures_detail::current_unit(m);
}

// Top panel: the points (used and not used), the fit with its bands, noise floor and contact.
plot::xy_panel current_panel(const curve_sweep& sweep, const fit_result& fit, const fitted_curve& c,
                             const figures_detail::current_unit_choice& unit) {
    const double eV = si::electron_volt, shift = std::log10(unit.per_A);
    std::vector<bool> used(sweep.z_m.size(), false);
    for (std::size_t i : fit.used_rows) used[i] = true;
    plot::series pts_used{{}, {}, fmt::format("used ({})", fit.used_rows.size()), plot::draw_style::markers, 0};
    plot::series pts_unused{{}, {}, "not used", plot::draw_style::markers, 3};
    for (std::size_t i = 0; i < sweep.z_m.size(); ++i) {
        const double a = std::abs(sweep.current_A[i]);
        if (!(a > 0.0)) continue;
        plot::series& s = used[i] ? pts_used : pts_unused;
        s.x.push_back(sweep.z_m[i] * per_nm);
        s.y.push_back(std::log10(a) + shift);
    }
    plot::series line{{}, {}, fmt::format("{} fit: φ_ap = {} eV", to_string(fit.model),
                                          with_uncertainty(fit.apparent_barrier_J / eV, fit.apparent_barrier_stderr_J / eV)),
                      plot::draw_style::line, 1};
    for (std::size_t k = 0; k < c.z_m.size(); ++k) {
        line.x.push_back(c.z_m[k] * per_nm);
        line.y.push_back(c.ln_fit[k] / ln10 + shift);
    }
    plot::xy_panel top;
    top.title = "log₁₀|I| against z";
    top.x_axis.label = "z [nm]";
    top.y_axis.label = fmt::format("log₁₀(|I| / 1 {})", unit.name);
    top.lines = {pts_used, pts_unused, line};
    if (pts_unused.x.empty()) top.lines.erase(top.lines.begin() + 1);
    top.bands = bands_about(c, line.y, fit.confidence_level);
    if (fit.noise_floor_A > 0)
        top.references.push_back({plot::orientation::horizontal, std::log10(fit.noise_floor_A) + shift, "noise floor"});
    if (fit.contact.kind != contact_kind::none)
        top.references.push_back({plot::orientation::vertical, fit.contact.z_m * per_nm, fmt::format("contact ({})", to_string(fit.contact.kind))});
    return top;
}

// Middle panel: residuals of the used points against the fit, with the bands about zero.
plot::xy_panel residual_panel(const curve_sweep& sweep, const fit_result& fit, const fitted_curve& c) {
    plot::xy_panel mid;
    mid.title = "residuals of the used points";
    mid.x_axis.label = "z [nm]";
    mid.y_axis.label = "log₁₀|I| − fit";
    const double sign = signal_sign(sweep, fit);
    plot::series res{{}, {}, "data − fit", plot::draw_style::markers, 0};
    for (std::size_t i : fit.used_rows) {
        res.x.push_back(sweep.z_m[i] * per_nm);
        res.y.push_back((std::log(std::abs(sweep.current_A[i])) - fitted_ln(fit, sign, sweep.z_m[i])) / ln10);
    }
    mid.lines.push_back(res);
    // At this scale the bands show their true width, which is thinner than a line above.
    mid.bands = bands_about(c, std::vector<double>(c.z_m.size(), 0.0), fit.confidence_level);
    mid.references.push_back({plot::orientation::horizontal, 0.0, ""});
    return mid;
}

// Bottom panel: the sliding-window φ_ap(z) with ± 1 standard error, and the whole-range value.
plot::xy_panel profile_panel(const fit_result& fit) {
    const double eV = si::electron_volt;
    plot::xy_panel bottom;
    bottom.title = "local apparent barrier height";
    bottom.x_axis.label = "z [nm]";
    bottom.y_axis.label = "φ_ap [eV]";
    plot::series prof{{}, {}, "sliding window", plot::draw_style::line_and_markers, 0};
    plot::band prof_band{{}, {}, {}, "± 1 standard error", 0};
    for (const profile_point& p : fit.profile) {
        prof.x.push_back(p.z_m * per_nm);
        prof.y.push_back(p.apparent_barrier_J / eV);
        prof_band.x.push_back(p.z_m * per_nm);
        prof_band.y_low.push_back((p.apparent_barrier_J - p.apparent_barrier_stderr_J) / eV);
        prof_band.y_high.push_back((p.apparent_barrier_J + p.apparent_barrier_stderr_J) / eV);
    }
    if (!prof.x.empty()) {
        bottom.lines.push_back(prof);
        bottom.bands.push_back(prof_band);
    }
    bottom.references.push_back({plot::orientation::horizontal, fit.apparent_barrier_J / eV, "whole-range fit"});
    return bottom;
}

// The model comparison's curve, residuals and φ_ap(z) added to the three panels.
void add_model(const curve_sweep& sweep, const fit_result& fit, const model_fit_result& model, double shift,
               plot::xy_panel& top, plot::xy_panel& mid, plot::xy_panel& bottom) {
    const double eV = si::electron_volt;
    plot::series m{{}, {}, fmt::format("model fit: mean work function {} eV", with_uncertainty(model.mean_work_function_J / eV,
                                                                                    model.mean_work_function_stderr_J / eV)),
                   plot::draw_style::line, 2};
    plot::series mr{{}, {}, "data − model", plot::draw_style::markers, 2};
    plot::series mp{{}, {}, "model φ_ap(z)", plot::draw_style::line, 2};
    for (std::size_t k = 0; k < model.z_m.size(); ++k) {
        m.x.push_back(model.z_m[k] * per_nm);
        m.y.push_back(model.ln_current_fit[k] / ln10 + shift);
        if (k > 0 && model.z_m[k] > model.z_m[k - 1]) {
            const double slope = (model.ln_current_fit[k] - model.ln_current_fit[k - 1]) / (model.z_m[k] - model.z_m[k - 1]);
            mp.x.push_back(0.5 * (model.z_m[k] + model.z_m[k - 1]) * per_nm);
            mp.y.push_back(apparent_barrier_from_decay(-0.5 * slope) / eV);
        }
    }
    // Residuals against the model at the used points (same z order as model.z_m).
    std::vector<std::size_t> rows = fit.used_rows;
    std::sort(rows.begin(), rows.end(), [&](std::size_t a, std::size_t b) { return sweep.z_m[a] < sweep.z_m[b]; });
    for (std::size_t k = 0; k < rows.size() && k < model.z_m.size(); ++k) {
        mr.x.push_back(sweep.z_m[rows[k]] * per_nm);
        mr.y.push_back((std::log(std::abs(sweep.current_A[rows[k]])) - model.ln_current_fit[k]) / ln10);
    }
    top.lines.push_back(m);
    mid.lines.push_back(mr);
    if (!mp.x.empty()) bottom.lines.push_back(mp);
}

}  // namespace

std::string numbered_plot_path(const std::string& path, std::size_t index, std::size_t count) {
    if (count <= 1) return path;
    std::filesystem::path p(path);
    return (p.parent_path() / fmt::format("{}-{}{}", p.stem().string(), index + 1, p.extension().string())).string();
}

std::vector<std::string> fit_plot_paths(const std::string& path, const std::vector<fit_plot_source>& sources) {
    if (sources.size() <= 1) return std::vector<std::string>(sources.size(), path);
    const std::filesystem::path p(path);
    std::map<std::string, std::size_t> per_file, taken;
    for (const fit_plot_source& s : sources) ++per_file[s.file];
    std::vector<std::string> out;
    for (const fit_plot_source& s : sources) {
        std::string name = fmt::format("{}-{}", p.stem().string(), std::filesystem::path(s.file).stem().string());
        if (per_file[s.file] > 1) name += fmt::format("-{}", to_string(s.direction));
        const std::size_t seen = taken[name]++;
        if (seen > 0) name += fmt::format("-{}", seen + 1);
        out.push_back((p.parent_path() / (name + p.extension().string())).string());
    }
    return out;
}

std::string fit_plot_title(const fit_plot_source& source) {
    return fmt::format("{} ({})", std::filesystem::path(source.file).filename().string(), to_string(source.direction));
}

plot::figure make_fit_figure(const curve_sweep& sweep, const fit_result& fit, const model_fit_result* model,
                             const std::string& title) {
    const figures_detail::current_unit_choice unit = unit_for(sweep);
    const fitted_curve c = fitted_with_bands(sweep, fit);
    plot::xy_panel top = current_panel(sweep, fit, c, unit);
    plot::xy_panel mid = residual_panel(sweep, fit, c);
    plot::xy_panel bottom = profile_panel(fit);
    if (model != nullptr && model->z_m.size() >= 2) add_model(sweep, fit, *model, std::log10(unit.per_A), top, mid, bottom);

    plot::figure f;
    f.title = title;
    f.panels = {top, mid, bottom};
    f.columns = 1;
    f.panel_height = 420;
    return f;
}

void write_fit_plots(std::vector<fitted_sweep>& all, const std::string& path) {
    std::vector<fit_plot_source> sources;
    for (const fitted_sweep& f : all) sources.push_back({f.curve->file, f.result.direction});
    const std::vector<std::string> paths = fit_plot_paths(path, sources);
    for (std::size_t k = 0; k < paths.size(); ++k) {
        fitted_sweep& f = all[k];
        f.plot_path = paths[k];
        plot::write_figure(make_fit_figure(*f.sweep, f.result, f.model ? &*f.model : nullptr, fit_plot_title(sources[k])),
                           f.plot_path);
    }
}

}  // namespace tipgap
