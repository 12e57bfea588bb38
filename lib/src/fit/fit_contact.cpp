// Point contact at the close end of a sweep: a conductance plateau near G0 = 2e²/h or a jump to
// contact (Gimzewski & Möller, Phys. Rev. B 36, 1284 (1987); Limot et al., Phys. Rev. Lett. 94,
// 126102 (2005) show both signatures on metal surfaces).
#include <algorithm>
#include <cmath>
#include <limits>

#include "fit/detail/fit_internal.hpp"
#include "tipgap/core/constants.hpp"

namespace tipgap::detail {
namespace {

// A single-atom contact conducts about 1 G0 on noble metals and up to ~2-3 G0 on transition metals;
// the plateau window is generous on both sides (common practice, no source).
constexpr double plateau_low_G0 = 0.5;
constexpr double plateau_high_G0 = 3.0;
constexpr std::size_t plateau_min_points = 3;
// A plateau is flat: its ln|I| range is below this fraction of what tunnelling would give over
// the same z extent (common practice, no source).
constexpr double plateau_flatness = 0.3;
// A jump is a step in ln|I| exceeding the tunnelling trend by ln 3 (common practice, no source),
// landing above 0.1 G0 so that a tip change far from contact is not mistaken for one.
const double jump_excess_ln = std::log(3.0);
constexpr double jump_min_G0 = 0.1;

// The close end of a sweep as the contact tests see it.
struct contact_view {
    std::span<const double> z;  // m, ascending
    std::span<const double> a;  // |I|, A
    double bias_V;
    bool have_bias;

    // Conductance of point i in G0 (NaN without a bias).
    double g0(std::size_t i) const {
        return have_bias ? a[i] / std::abs(bias_V) / si::conductance_quantum : std::numeric_limits<double>::quiet_NaN();
    }
    double ln_i(std::size_t i) const { return std::log(std::max(a[i], std::numeric_limits<double>::min())); }
    // Length of the run of close-end points with a conductance in the plateau window.
    std::size_t plateau_run() const {
        std::size_t run = 0;
        while (run < z.size() && g0(run) >= plateau_low_G0 && g0(run) <= plateau_high_G0) ++run;
        return run;
    }
};

// Shortcut for the common case of no contact, with the same answer as the full tests: with z
// ascending the trend term is >= 0, so a jump needs some close-half step of ln|I| above ln 3
// itself, i.e. a ratio of currents above 3; a step below 2.9 is clear of ln 3 by far more than
// rounding. A plateau needs a run of at least 3 close points near G0. When neither is possible
// the median of the slopes (most of detect_contact's cost) is not needed.
bool contact_possible(const contact_view& v) {
    const std::size_t n = v.z.size();
    if (v.have_bias && v.plateau_run() >= plateau_min_points) return true;
    for (std::size_t i = 0; i + 1 < n / 2 + 1 && i + 1 < n; ++i) {
        const double lo = std::max(v.a[i + 1], std::numeric_limits<double>::min());
        if (!(v.a[i] <= 2.9 * lo)) return true;
    }
    return false;
}

// Tunnelling trend 2κ (1/m, >= 0): the median of the point-to-point log slopes above the floor;
// NaN when no pair of neighbours lies above it.
double tunnelling_trend(const contact_view& v, double floor_A) {
    std::vector<double> slopes;
    slopes.reserve(v.z.size());
    for (std::size_t i = 0; i + 1 < v.z.size(); ++i) {
        const double dz = v.z[i + 1] - v.z[i];
        if (dz > 0 && v.a[i] > floor_A && v.a[i + 1] > floor_A) slopes.push_back((v.ln_i(i) - v.ln_i(i + 1)) / dz);
    }
    if (slopes.empty()) return std::numeric_limits<double>::quiet_NaN();
    return std::max(median(slopes), 0.0);
}

// Plateau: the run of close-end points with G near G0, flatter than tunnelling.
contact_result find_plateau(const contact_view& v, double trend, double contact_distance_m) {
    contact_result out;
    if (!v.have_bias) return out;
    const std::size_t n = v.z.size();
    const std::size_t run = v.plateau_run();
    if (run < plateau_min_points) return out;
    double lo = v.ln_i(0), hi = v.ln_i(0);
    for (std::size_t i = 1; i < run; ++i) {
        lo = std::min(lo, v.ln_i(i));
        hi = std::max(hi, v.ln_i(i));
    }
    const double extent = v.z[run - 1] - v.z[0];
    if (!(extent > 0 && hi - lo < plateau_flatness * trend * extent)) return out;
    out.kind = contact_kind::plateau;
    out.z_m = run < n ? 0.5 * (v.z[run - 1] + v.z[run]) : v.z[run - 1];
    double g_sum = 0.0;
    for (std::size_t i = 0; i < run; ++i) g_sum += v.g0(i);
    out.conductance_G0 = g_sum / static_cast<double>(run);
    out.points_in_contact = run;
    out.gap_offset_m = contact_distance_m - out.z_m;
    return out;
}

// Jump: the largest excess step in the closer half of the sweep.
contact_result find_jump(const contact_view& v, double trend, double floor_A, double contact_distance_m) {
    contact_result out;
    const std::size_t n = v.z.size();
    double best_excess = jump_excess_ln;
    std::size_t best = n;
    for (std::size_t i = 0; i + 1 < n / 2 + 1 && i + 1 < n; ++i) {
        const double dz = v.z[i + 1] - v.z[i];
        if (v.a[i + 1] <= floor_A) continue;
        const double excess = (v.ln_i(i) - v.ln_i(i + 1)) - trend * dz;
        if (excess > best_excess && (!v.have_bias || v.g0(i) >= jump_min_G0)) {
            best_excess = excess;
            best = i;
        }
    }
    if (best < n) {
        out.kind = contact_kind::jump;
        out.z_m = 0.5 * (v.z[best] + v.z[best + 1]);
        out.conductance_G0 = v.g0(best);
        out.points_in_contact = best + 1;
        out.gap_offset_m = contact_distance_m - out.z_m;
    }
    return out;
}

}  // namespace

contact_result detect_contact(std::span<const double> z_m, std::span<const double> abs_current, double floor_A,
                              double bias_V, double contact_distance_m) {
    if (z_m.size() < 4) return {};
    const contact_view v{z_m, abs_current, bias_V, std::isfinite(bias_V) && bias_V != 0.0};
    if (!contact_possible(v)) return {};
    const double trend = tunnelling_trend(v, floor_A);
    if (std::isnan(trend)) return {};
    const contact_result plateau = find_plateau(v, trend, contact_distance_m);
    if (plateau.kind != contact_kind::none) return plateau;
    return find_jump(v, trend, floor_A, contact_distance_m);
}

}  // namespace tipgap::detail
