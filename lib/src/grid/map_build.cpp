// Barrier maps: one fit per pixel while the grid streams past, results placed by position.
#include <algorithm>
#include <chrono>
#include <cmath>
#include <fmt/format.h>
#include <limits>
#include <memory>

#include "fit/detail/fit_fast.hpp"
#include "grid/detail/pixel_quality.hpp"
#include "tipgap/grid/map.hpp"

namespace tipgap {

void map_options::validate() const {
    fit.validate();
    if (!(min_current_decades > 0.0) || !std::isfinite(min_current_decades))
        throw_input(location{"", 0, 0, "min_current_decades"}, "must be > 0");
    if (!(max_relative_stderr > 0.0)) throw_input(location{"", 0, 0, "max_relative_stderr"}, "must be > 0");
    if (read.threads < 0) throw_input(location{"", 0, 0, "threads"}, "must be >= 0 (0 = all cores)");
}

pixel_quality classify_pixel(const fit_result& r, bool fitted, const map_options& o) {
    if (!fitted) return pixel_quality::too_few_points;
    const bool poor = !(r.decay_constant_per_m > 0.0) || !(r.current_decades_used >= o.min_current_decades) ||
                      !(r.apparent_barrier_stderr_J <= o.max_relative_stderr * r.apparent_barrier_J) ||
                      r.status != fit_status::converged;
    if (poor) return pixel_quality::poor_fit;
    if (r.contact.kind != contact_kind::none) return pixel_quality::contact;
    if (r.points_saturated > 0) return pixel_quality::saturated;
    return pixel_quality::ok;
}

namespace {

// Hyndman & Fan definition 7 on sorted values.
double percentile_sorted(const std::vector<double>& s, double level) {
    const double h = (static_cast<double>(s.size()) - 1.0) * level / 100.0;
    const auto lo = static_cast<std::size_t>(std::floor(h));
    const std::size_t hi = std::min(lo + 1, s.size() - 1);
    return s[lo] + (h - static_cast<double>(lo)) * (s[hi] - s[lo]);
}

struct pixel_record {
    double x_m, y_m;
    double kappa, kappa_se, phi, phi_se, r2;
    std::uint32_t used;
    pixel_quality q;
};

double median_spacing(const std::vector<double>& v, bool& uniform) {
    if (v.size() < 2) return 0.0;
    std::vector<double> d(v.size() - 1);
    for (std::size_t i = 1; i < v.size(); ++i) d[i - 1] = v[i] - v[i - 1];
    const double med = detail::median(d);
    // Positions written in decimal nm carry rounding of ~1e-16 relative; 1e-6 allows for that and
    // for positions printed to 6-7 digits (common practice, no source).
    for (double x : d) {
        if (std::abs(x - med) > 1e-6 * med) uniform = false;
    }
    return med;
}

}  // namespace

map_statistics summarize(const std::vector<double>& values) {
    map_statistics s;
    std::vector<double> v;
    v.reserve(values.size());
    for (double x : values) {
        if (std::isfinite(x)) v.push_back(x);
    }
    s.count = v.size();
    if (v.empty()) {
        const double nan = std::numeric_limits<double>::quiet_NaN();
        s.mean = s.median = s.standard_deviation = s.robust_spread = s.min = s.max = nan;
        s.percentiles.fill(nan);
        return s;
    }
    std::sort(v.begin(), v.end());
    double sum = 0.0;
    for (double x : v) sum += x;
    s.mean = sum / static_cast<double>(v.size());
    double ss = 0.0;
    for (double x : v) ss += (x - s.mean) * (x - s.mean);
    s.standard_deviation = v.size() > 1 ? std::sqrt(ss / static_cast<double>(v.size() - 1)) : 0.0;
    s.median = percentile_sorted(v, 50.0);
    s.min = v.front();
    s.max = v.back();
    for (std::size_t k = 0; k < s.percentiles.size(); ++k) s.percentiles[k] = percentile_sorted(v, map_statistics::percentile_levels[k]);
    // 1.4826 = 1/Φ⁻¹(3/4) (Rousseeuw & Croux, J. Am. Stat. Assoc. 88, 1273 (1993)).
    s.robust_spread = 1.482602218505602 * detail::mad(v);
    return s;
}

namespace {

// Per-thread state of the map: the fit's workspace and result, and the pixels fitted so far.
struct slot_state {
    fit_workspace ws;
    fit_result r;
    std::vector<pixel_record> records;
};

// The samples to fit: the pixel's own, or when its z turns back (approach and retract recorded)
// its first sweep, kept in `first`.
void first_sweep(const grid_pixel_view& px, curve_sweep& first, std::span<const double>& z,
                 std::span<const double>& current) {
    z = px.z_m;
    current = px.current_A;
    bool monotonic_up = true, monotonic_down = true;
    for (std::size_t i = 1; i < z.size(); ++i) {
        monotonic_up = monotonic_up && z[i] >= z[i - 1];
        monotonic_down = monotonic_down && z[i] <= z[i - 1];
    }
    if (!monotonic_up && !monotonic_down && z.size() >= 3) {
        const std::vector<double> zz(z.begin(), z.end()), ii(current.begin(), current.end());
        first = split_at_turns(zz, ii).front();
        z = first.z_m;
        current = first.current_A;
    }
}

// Fits one pixel into st.r; false when there were too few points.
bool fit_pixel(const grid_pixel_view& px, const fit_options& fo, slot_state& st) {
    curve_sweep first;
    std::span<const double> z, current;
    first_sweep(px, first, z, current);
    if (fo.model == fit_model::linear) return fit_sweep_fast(z, current, px.bias_V, fo, st.ws, st.r);
    // The offset model (Levenberg-Marquardt) has no lean path; fit_sweep throws for too few points.
    curve_sweep s;
    s.z_m.assign(z.begin(), z.end());
    s.current_A.assign(current.begin(), current.end());
    try {
        st.r = fit_sweep(s, px.bias_V, fo, px.where);
        return true;
    } catch (const error&) {
        st.r = fit_result{};
        st.r.points_total = s.z_m.size();
        return false;
    }
}

pixel_record record_of(const grid_pixel_view& px, const fit_result& r, bool fitted, pixel_quality q) {
    const bool has_value = q == pixel_quality::ok || q == pixel_quality::saturated || q == pixel_quality::contact;
    const double nan = std::numeric_limits<double>::quiet_NaN();
    return pixel_record{px.x_m, px.y_m, has_value ? r.decay_constant_per_m : nan,
                        has_value ? r.decay_constant_stderr_per_m : nan, has_value ? r.apparent_barrier_J : nan,
                        has_value ? r.apparent_barrier_stderr_J : nan, fitted ? r.r_squared : nan,
                        static_cast<std::uint32_t>(fitted ? r.points_used : 0), q};
}

// The matrices of `out` (grid already read) from every slot's records, placed by position.
void place_records(barrier_map& out, const std::vector<std::unique_ptr<slot_state>>& state) {
    out.nx = out.grid.x_m.size();
    out.ny = out.grid.y_m.size();
    const std::size_t n = out.nx * out.ny;
    const double nan = std::numeric_limits<double>::quiet_NaN();
    out.decay_constant_per_m.assign(n, nan);
    out.decay_constant_stderr_per_m.assign(n, nan);
    out.apparent_barrier_J.assign(n, nan);
    out.apparent_barrier_stderr_J.assign(n, nan);
    out.r_squared.assign(n, nan);
    out.points_used.assign(n, 0);
    out.quality.assign(n, pixel_quality::missing);  // a node without a record: not in the file
    for (const auto& st : state) {
        for (const pixel_record& p : st->records) {
            // read_grid has checked that every position is a grid node, once.
            const auto ix = static_cast<std::size_t>(std::lower_bound(out.grid.x_m.begin(), out.grid.x_m.end(), p.x_m) -
                                                     out.grid.x_m.begin());
            const auto iy = static_cast<std::size_t>(std::lower_bound(out.grid.y_m.begin(), out.grid.y_m.end(), p.y_m) -
                                                     out.grid.y_m.begin());
            const std::size_t k = iy * out.nx + ix;
            out.decay_constant_per_m[k] = p.kappa;
            out.decay_constant_stderr_per_m[k] = p.kappa_se;
            out.apparent_barrier_J[k] = p.phi;
            out.apparent_barrier_stderr_J[k] = p.phi_se;
            out.r_squared[k] = p.r2;
            out.points_used[k] = p.used;
            out.quality[k] = p.q;
        }
    }
}

}  // namespace

barrier_map make_barrier_map(const std::string& path, const map_options& options) {
    return make_barrier_map([&](const grid_visitor& visit) { return read_grid(path, options.read, visit); }, options);
}

barrier_map make_barrier_map(const grid_source& source, const map_options& options) {
    options.validate();
    const unsigned slots = resolved_threads(options.read) + 1;
    std::vector<std::unique_ptr<slot_state>> state;
    for (unsigned s = 0; s < slots; ++s) state.push_back(std::make_unique<slot_state>());
    auto visit = [&](const grid_pixel_view& px, unsigned slot) {
        slot_state& st = *state[slot];
        const bool fitted = fit_pixel(px, options.fit, st);
        st.records.push_back(record_of(px, st.r, fitted, classify_pixel(st.r, fitted, options)));
    };

    const auto t0 = std::chrono::steady_clock::now();
    barrier_map out;
    out.grid = source(visit);
    out.read_and_fit_seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    place_records(out, state);
    for (pixel_quality q : out.quality) ++out.quality_counts[static_cast<std::size_t>(q)];
    out.pitch_x_m = median_spacing(out.grid.x_m, out.uniform_pitch);
    out.pitch_y_m = median_spacing(out.grid.y_m, out.uniform_pitch);
    out.barrier = summarize(out.apparent_barrier_J);
    return out;
}

}  // namespace tipgap
