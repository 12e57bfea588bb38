// Building the three-panel figure of a fitted sweep (see fit_plot.hpp).
#include "tipgap/figures/fit_plot.hpp"

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fmt/format.h>

#include "tipgap/core/constants.hpp"

namespace tipgap {
namespace {

constexpr double per_nm = 1e9;
constexpr std::size_t band_points = 101;

}  // namespace

std::string numbered_plot_path(const std::string& path, std::size_t index, std::size_t count) {
    if (count <= 1) return path;
    std::filesystem::path p(path);
    return (p.parent_path() / fmt::format("{}-{}{}", p.stem().string(), index + 1, p.extension().string())).string();
}

namespace {

// ln|I| of the fitted model at z. The offset model fits the current with the sign of the signal;
// offset_A carries the sign of the current, so |I| = I0 e^(-2κ(z - z_ref)) + sign · offset.
struct fitted_ln_current {
    const fit_result& fit;
    double sign = 1.0;

    fitted_ln_current(const curve_sweep& sweep, const fit_result& f) : fit(f) {
        double sign_sum = 0.0;
        for (std::size_t i : fit.used_rows) sign_sum += sweep.current_A[i];
        sign = sign_sum < 0.0 ? -1.0 : 1.0;
    }
    double operator()(double z) const {
        if (fit.model == fit_model::offset) {
            const double i = fit.prefactor_A * std::exp(-2.0 * fit.decay_constant_per_m * (z - fit.z_ref_m)) +
                             sign * fit.offset_A;
            return i > 0 ? std::log(i) : NAN;
        }
        return fit.line.intercept + fit.line.slope * z;
    }
};

// The fitted line over the used z range and, for the linear model, its confidence band.
void add_fit_line(const curve_sweep& sweep, const fit_result& fit, const fitted_ln_current& fitted,
                  plot::xy_panel& top) {
    const double eV = si::electron_volt;
    double z_lo = INFINITY, z_hi = -INFINITY;
    for (std::size_t i : fit.used_rows) {
        z_lo = std::min(z_lo, sweep.z_m[i]);
        z_hi = std::max(z_hi, sweep.z_m[i]);
    }
    plot::series line{{}, {}, fmt::format("{} fit: φ_ap = {:.3f} ± {:.3f} eV", to_string(fit.model),
                                          fit.apparent_barrier_J / eV, fit.apparent_barrier_stderr_J / eV),
                      plot::draw_style::line, 1};
    plot::band band{{}, {}, {}, fmt::format("{:.0f} % band", 100.0 * fit.confidence_level), 1};
    for (std::size_t k = 0; k < band_points; ++k) {
        const double z = z_lo + (z_hi - z_lo) * static_cast<double>(k) / (band_points - 1);
        line.x.push_back(z * per_nm);
        line.y.push_back(fitted(z));
        if (fit.model == fit_model::linear) {
            const double var = fit.line.intercept_stderr * fit.line.intercept_stderr +
                               z * z * fit.line.slope_stderr * fit.line.slope_stderr + 2.0 * z * fit.line.covariance;
            const double half = fit.t_quantile * std::sqrt(std::max(var, 0.0));
            band.x.push_back(z * per_nm);
            band.y_low.push_back(line.y.back() - half);
            band.y_high.push_back(line.y.back() + half);
        }
    }
    top.lines.push_back(line);
    if (!band.x.empty()) top.bands.push_back(band);
}

// Top panel: the points (used and not used), the fit with its band, noise floor and contact.
plot::xy_panel data_panel(const curve_sweep& sweep, const fit_result& fit, const fitted_ln_current& fitted) {
    std::vector<bool> used(sweep.z_m.size(), false);
    for (std::size_t i : fit.used_rows) used[i] = true;
    plot::series pts_used{{}, {}, fmt::format("used ({})", fit.used_rows.size()), plot::draw_style::markers, 0};
    plot::series pts_unused{{}, {}, "not used", plot::draw_style::markers, 3};
    for (std::size_t i = 0; i < sweep.z_m.size(); ++i) {
        const double a = std::abs(sweep.current_A[i]);
        if (!(a > 0.0)) continue;
        plot::series& s = used[i] ? pts_used : pts_unused;
        s.x.push_back(sweep.z_m[i] * per_nm);
        s.y.push_back(std::log(a));
    }
    plot::xy_panel top;
    top.title = "ln|I| against z";
    top.x_axis.label = "z [nm]";
    top.y_axis.label = "ln(|I| / 1 A)";
    top.lines = {pts_used};
    if (!pts_unused.x.empty()) top.lines.push_back(pts_unused);
    add_fit_line(sweep, fit, fitted, top);
    if (fit.noise_floor_A > 0) top.references.push_back({plot::orientation::horizontal, std::log(fit.noise_floor_A), "noise floor"});
    if (fit.contact.kind != contact_kind::none)
        top.references.push_back({plot::orientation::vertical, fit.contact.z_m * per_nm, fmt::format("contact ({})", to_string(fit.contact.kind))});
    return top;
}

// Middle panel: residuals of the used points against the fit.
plot::xy_panel residual_panel(const curve_sweep& sweep, const fit_result& fit, const fitted_ln_current& fitted) {
    plot::xy_panel mid;
    mid.title = "residuals of the used points";
    mid.x_axis.label = "z [nm]";
    mid.y_axis.label = "ln|I| − fit";
    plot::series res{{}, {}, "data − fit", plot::draw_style::markers, 0};
    for (std::size_t i : fit.used_rows) {
        res.x.push_back(sweep.z_m[i] * per_nm);
        res.y.push_back(std::log(std::abs(sweep.current_A[i])) - fitted(sweep.z_m[i]));
    }
    mid.lines.push_back(res);
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
    bottom.legend = plot::legend_position::bottom_right;
    return bottom;
}

// The model comparison in all three panels: its ln I(z), its residuals and its φ_ap(z).
void add_model_fit(const curve_sweep& sweep, const fit_result& fit, const model_fit_result& model,
                   plot::xy_panel& top, plot::xy_panel& mid, plot::xy_panel& bottom) {
    const double eV = si::electron_volt;
    plot::series m{{}, {}, fmt::format("model fit: mean work function {:.3f} ± {:.3f} eV", model.mean_work_function_J / eV,
                                       model.mean_work_function_stderr_J / eV),
                   plot::draw_style::line, 2};
    plot::series mr{{}, {}, "data − model", plot::draw_style::markers, 2};
    plot::series mp{{}, {}, "model φ_ap(z)", plot::draw_style::line, 2};
    for (std::size_t k = 0; k < model.z_m.size(); ++k) {
        m.x.push_back(model.z_m[k] * per_nm);
        m.y.push_back(model.ln_current_fit[k]);
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
        mr.y.push_back(std::log(std::abs(sweep.current_A[rows[k]])) - model.ln_current_fit[k]);
    }
    top.lines.push_back(m);
    mid.lines.push_back(mr);
    if (!mp.x.empty()) bottom.lines.push_back(mp);
}

}  // namespace

plot::figure make_fit_figure(const curve_sweep& sweep, const fit_result& fit, const model_fit_result* model,
                             const std::string& title) {
    const fitted_ln_current fitted(sweep, fit);
    plot::xy_panel top = data_panel(sweep, fit, fitted);
    plot::xy_panel mid = residual_panel(sweep, fit, fitted);
    plot::xy_panel bottom = profile_panel(fit);
    if (model != nullptr && model->z_m.size() >= 2) add_model_fit(sweep, fit, *model, top, mid, bottom);

    plot::figure f;
    f.title = title;
    f.panels = {top, mid, bottom};
    f.columns = 1;
    f.panel_height = 420;
    return f;
}

}  // namespace tipgap
