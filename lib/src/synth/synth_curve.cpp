// Generating one synthetic curve: sweep schedule, drift, model current, contact, floor, noise,
// clipping (the chain documented in synth.hpp), and the ground truth a fit should recover.
#include <algorithm>
#include <charconv>
#include <cmath>
#include <fmt/format.h>

#include "synth/detail/normal_source.hpp"
#include "synth/detail/synth_internal.hpp"
#include "tipgap/core/limits.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/model/geometry.hpp"

namespace tipgap {

void synth_options::validate(const model_options& model) const {
    auto bad = [](const char* key, const std::string& what) { throw_input(location{"", 0, 0, key}, what); };
    if (!(std::isfinite(bias_V) && bias_V != 0.0 && std::abs(bias_V) <= model.bias_limit_V))
        bad("bias_V", fmt::format("must be non-zero and within the bias limit of {:g} V", model.bias_limit_V));
    if (!(gap_min_m > 0.0 && std::isfinite(gap_min_m))) bad("gap_min_m", "must be > 0");
    if (!(gap_max_m > gap_min_m))
        bad("gap_max_m", fmt::format("the range {:g} nm..{:g} nm does not rise; expected FROM below TO", gap_min_m * 1e9,
                                     gap_max_m * 1e9));
    if (!at_most(gap_max_m, 10e-9)) bad("gap_max_m", fmt::format("{:g} nm is too far; expected at most 10 nm", gap_max_m * 1e9));
    // A span of a few picometres holds no decay information: the fit would see noise only.
    if (gap_max_m - gap_min_m < min_gap_span_m)
        bad("gap_max_m", fmt::format("the range {:g} nm..{:g} nm spans {:.3g} pm; expected at least {:g} pm", gap_min_m * 1e9,
                                     gap_max_m * 1e9, (gap_max_m - gap_min_m) * 1e12, min_gap_span_m * 1e12));
    if (points < 8 || points > 1000000) bad("points", "must be in [8, 1000000]");
    if (!std::isnan(gap_at_z0_m) && !std::isfinite(gap_at_z0_m)) bad("gap_at_z0_m", "must be finite");
    if (!(current_noise_A >= 0.0 && at_most(current_noise_A, max_synth_current_A)))
        bad("current_noise_A", fmt::format("must be from 0 to {:g} A", max_synth_current_A));
    if (!(std::abs(baseline_A) <= max_synth_current_A))
        bad("baseline_A", fmt::format("must be within ±{:g} A", max_synth_current_A));
    if (!(gap_jitter_m >= 0.0 && gap_jitter_m <= 0.1e-9)) bad("gap_jitter_m", "must be in [0, 0.1 nm]");
    if (!(saturation_A >= 0.0 && std::isfinite(saturation_A))) bad("saturation_A", "must be >= 0 (0 = no clipping)");
    if (!(std::abs(drift_m) < 1e-9)) bad("drift_m", "must be below 1 nm in magnitude");
    if (!(jump_gap_m >= 0.0 && jump_gap_m < gap_max_m)) bad("jump_gap_m", "must be >= 0 and below the farthest gap");
    if (!(contact_conductance_G0 > 0.0 && contact_conductance_G0 <= 100.0))
        bad("contact_conductance_G0", "must be in (0, 100]");
    if (gap_min_m + std::min(drift_m, 0.0) <= 0.0) bad("drift_m", "would drive the gap to zero or below");
}

namespace detail {

config with_work_functions(const config& c, double tip_J, double sample_J) {
    config out = c;
    out.model.tip.work_function_J = tip_J;
    out.model.sample.work_function_J = sample_J;
    return out;
}

bool usable_current(double abs_current_A, const synth_options& o) {
    const double floor = std::abs(o.baseline_A) + 3.0 * o.current_noise_A;
    return abs_current_A > floor && (o.saturation_A <= 0.0 || abs_current_A < o.saturation_A);
}

double expected_decay(std::span<const double> z_m, std::span<const double> current_A, const std::vector<bool>& use) {
    std::vector<double> x, y, w;
    double i_max = 0.0;
    for (std::size_t k = 0; k < z_m.size(); ++k)
        if (use[k]) i_max = std::max(i_max, std::abs(current_A[k]));
    for (std::size_t k = 0; k < z_m.size(); ++k) {
        if (!use[k]) continue;
        const double a = std::abs(current_A[k]);
        x.push_back(z_m[k]);
        y.push_back(std::log(a));
        // σ_lnI = σ_I/|I|, so w ∝ |I|²; scaled by the maximum to stay well inside double range.
        w.push_back((a / i_max) * (a / i_max));
    }
    if (x.size() < 3) return std::nan("");
    return -0.5 * fit_line(x, y, w).slope;
}

void model_range_truth(const config& c, const synth_options& o, synth_truth& t) {
    auto current = [&](double s) { return total_current(c.model, c.geometry, s, o.bias_V); };
    // Local κ by a central difference; h = 2 pm keeps the truncation error (~h² κ''') far below
    // the model's 1e-6 relative accuracy divided by h (common practice, no source).
    constexpr double h = 2e-12;
    auto local_kappa = [&](double s) { return -0.25 * std::log(std::abs(current(s + h) / current(s - h))) / h; };
    t.tip_work_function_J = c.model.tip.work_function_J;
    t.sample_work_function_J = c.model.sample.work_function_J;
    t.mean_work_function_J = 0.5 * (t.tip_work_function_J + t.sample_work_function_J);
    t.decay_constant_at_gap_min_per_m = local_kappa(o.gap_min_m);
    t.decay_constant_at_gap_max_per_m = local_kappa(o.gap_max_m);
    t.apparent_barrier_at_gap_min_J = apparent_barrier_from_decay(t.decay_constant_at_gap_min_per_m);
    t.apparent_barrier_at_gap_max_J = apparent_barrier_from_decay(t.decay_constant_at_gap_max_per_m);
    // Range slope on 33 equally spaced gaps (equal weights): the model's mean decay over the range.
    constexpr int range_points = 33;
    std::vector<double> s(range_points), y(range_points);
    for (int k = 0; k < range_points; ++k) {
        s[k] = o.gap_min_m + (o.gap_max_m - o.gap_min_m) * k / (range_points - 1);
        const double i = current(s[k]);
        if (k == 0) t.current_at_gap_min_A = i;
        if (k == range_points - 1) t.current_at_gap_max_A = i;
        y[k] = std::log(std::abs(i));
    }
    t.decay_constant_range_per_m = -0.5 * fit_line(s, y).slope;
    t.apparent_barrier_range_J = apparent_barrier_from_decay(t.decay_constant_range_per_m);
    t.noise_floor_A = std::abs(o.baseline_A) + 3.0 * o.current_noise_A;
}

}  // namespace detail

synth_curve synthesise_curve(const config& c, const synth_options& o) {
    o.validate(c.model);
    synth_curve out;
    synth_truth& t = out.truth;
    t.gap_at_z0_m = std::isnan(o.gap_at_z0_m) ? o.gap_min_m : o.gap_at_z0_m;
    detail::model_range_truth(c, o, t);
    if (o.jump_gap_m > 0.0) t.jump_z_m = o.jump_gap_m - t.gap_at_z0_m;

    std::vector<sweep_direction> plan;
    if (o.sweeps == synth_sweeps::approach || o.sweeps == synth_sweeps::approach_retract)
        plan.push_back(sweep_direction::approach);
    if (o.sweeps == synth_sweeps::retract || o.sweeps == synth_sweeps::approach_retract)
        plan.push_back(sweep_direction::retract);
    const std::size_t total = plan.size() * o.points;
    out.samples.reserve(total);
    detail::normal_source noise(o.seed);
    const double plateau_A = o.contact_conductance_G0 * si::conductance_quantum * o.bias_V;
    std::size_t k = 0;
    for (sweep_direction d : plan) {
        synth_sweep_truth st;
        st.direction = d;
        st.first_row = k;
        st.rows = o.points;
        for (std::size_t j = 0; j < o.points; ++j, ++k) {
            const double frac = static_cast<double>(j) / static_cast<double>(o.points - 1);
            const double s_nom = d == sweep_direction::retract ? o.gap_min_m + (o.gap_max_m - o.gap_min_m) * frac
                                                               : o.gap_max_m - (o.gap_max_m - o.gap_min_m) * frac;
            synth_sample p;
            p.direction = d;
            p.z_m = s_nom - t.gap_at_z0_m;
            p.true_gap_m = s_nom + o.drift_m * static_cast<double>(k) / static_cast<double>(total - 1);
            p.model_current_A = total_current(c.model, c.geometry, p.true_gap_m, o.bias_V);
            p.in_contact = o.jump_gap_m > 0.0 && p.true_gap_m < o.jump_gap_m;
            double i = p.in_contact ? plateau_A : p.model_current_A;
            // Gap jitter draws its own deviate before the current noise, only when asked for, so
            // files without it keep their noise sequence; the truth stays jitter-free.
            if (o.gap_jitter_m > 0.0) {
                const double jittered_gap = p.true_gap_m + o.gap_jitter_m * noise.next();
                if (!p.in_contact) i = total_current(c.model, c.geometry, jittered_gap, o.bias_V);
            }
            i += o.baseline_A + o.current_noise_A * noise.next();
            if (o.saturation_A > 0.0) i = std::clamp(i, -o.saturation_A, o.saturation_A);
            p.current_A = i;
            out.samples.push_back(p);
        }
        // Expected decay: noise-free model over the usable points of this sweep, recorded z (with
        // drift) and, for the model's own value, the drift-free gap.
        std::vector<double> z, s, i_drift, i_nominal;
        std::vector<bool> use;
        for (std::size_t m = st.first_row; m < st.first_row + st.rows; ++m) {
            const synth_sample& p = out.samples[m];
            z.push_back(p.z_m);
            // The baseline is part of what the instrument records: a linear fit of ln|I| sees it.
            i_drift.push_back(p.model_current_A + o.baseline_A);
            use.push_back(!p.in_contact && detail::usable_current(std::abs(i_drift.back()), o));
            if (use.back()) ++st.usable_points;
        }
        for (std::size_t m = 0; m < z.size(); ++m) {
            // Drift-free model current at the nominal gap, without the baseline (the model's own
            // current at the recorded gap when there is no drift).
            i_nominal.push_back(o.drift_m == 0.0 ? out.samples[st.first_row + m].model_current_A
                                                 : total_current(c.model, c.geometry, z[m] + t.gap_at_z0_m, o.bias_V));
        }
        // Expected: with drift and baseline, as a noise-free instrument would record the current.
        // Model: the same points, drift-free and without the baseline, the physics alone.
        st.decay_constant_expected_per_m = detail::expected_decay(z, i_drift, use);
        st.decay_constant_model_per_m = detail::expected_decay(z, i_nominal, use);
        st.apparent_barrier_expected_J = apparent_barrier_from_decay(st.decay_constant_expected_per_m);
        st.apparent_barrier_model_J = apparent_barrier_from_decay(st.decay_constant_model_per_m);
        t.sweeps.push_back(st);
    }
    return out;
}

}  // namespace tipgap
