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

}  // namespace

contact_result detect_contact(std::span<const double> z_m, std::span<const double> abs_current, double floor_A,
                              double bias_V, double contact_distance_m) {
    contact_result out;
    const std::size_t n = z_m.size();
    if (n < 4) return out;
    const bool have_bias = std::isfinite(bias_V) && bias_V != 0.0;
    auto g0 = [&](std::size_t i) {
        return have_bias ? abs_current[i] / std::abs(bias_V) / si::conductance_quantum
                         : std::numeric_limits<double>::quiet_NaN();
    };
    auto ln_i = [&](std::size_t i) { return std::log(std::max(abs_current[i], std::numeric_limits<double>::min())); };

    // Shortcut for the common case of no contact, with the same answer as the full test below:
    // with z ascending the trend term is >= 0, so a jump needs some close-half step of ln|I|
    // above ln 3 itself, i.e. a ratio of currents above 3; a step below 2.9 is clear of ln 3 by
    // far more than rounding. A plateau needs a run of at least 3 close points near G0. When
    // neither is possible the median of the slopes (most of this function's cost) is not needed.
    {
        bool plateau_possible = false;
        if (have_bias) {
            std::size_t run = 0;
            while (run < n && g0(run) >= plateau_low_G0 && g0(run) <= plateau_high_G0) ++run;
            plateau_possible = run >= plateau_min_points;
        }
        bool step_possible = false;
        for (std::size_t i = 0; i + 1 < n / 2 + 1 && i + 1 < n; ++i) {
            const double lo = std::max(abs_current[i + 1], std::numeric_limits<double>::min());
            if (!(abs_current[i] <= 2.9 * lo)) {
                step_possible = true;
                break;
            }
        }
        if (!plateau_possible && !step_possible) return out;
    }

    // Tunnelling trend: median of the point-to-point log slopes above the floor.
    std::vector<double> slopes;
    slopes.reserve(n);
    for (std::size_t i = 0; i + 1 < n; ++i) {
        const double dz = z_m[i + 1] - z_m[i];
        if (dz > 0 && abs_current[i] > floor_A && abs_current[i + 1] > floor_A)
            slopes.push_back((ln_i(i) - ln_i(i + 1)) / dz);
    }
    if (slopes.empty()) return out;
    const double trend = std::max(median(slopes), 0.0);  // 2κ, 1/m

    // Plateau: the run of close-end points with G near G0, flatter than tunnelling.
    if (have_bias) {
        std::size_t run = 0;
        while (run < n && g0(run) >= plateau_low_G0 && g0(run) <= plateau_high_G0) ++run;
        if (run >= plateau_min_points) {
            double lo = ln_i(0), hi = ln_i(0);
            for (std::size_t i = 1; i < run; ++i) {
                lo = std::min(lo, ln_i(i));
                hi = std::max(hi, ln_i(i));
            }
            const double extent = z_m[run - 1] - z_m[0];
            if (extent > 0 && hi - lo < plateau_flatness * trend * extent) {
                out.kind = contact_kind::plateau;
                out.z_m = run < n ? 0.5 * (z_m[run - 1] + z_m[run]) : z_m[run - 1];
                double g_sum = 0.0;
                for (std::size_t i = 0; i < run; ++i) g_sum += g0(i);
                out.conductance_G0 = g_sum / static_cast<double>(run);
                out.points_in_contact = run;
                out.gap_offset_m = contact_distance_m - out.z_m;
                return out;
            }
        }
    }

    // Jump: the largest excess step in the closer half of the sweep.
    double best_excess = jump_excess_ln;
    std::size_t best = n;
    for (std::size_t i = 0; i + 1 < n / 2 + 1 && i + 1 < n; ++i) {
        const double dz = z_m[i + 1] - z_m[i];
        if (abs_current[i + 1] <= floor_A) continue;
        const double excess = (ln_i(i) - ln_i(i + 1)) - trend * dz;
        if (excess > best_excess && (!have_bias || g0(i) >= jump_min_G0)) {
            best_excess = excess;
            best = i;
        }
    }
    if (best < n) {
        out.kind = contact_kind::jump;
        out.z_m = 0.5 * (z_m[best] + z_m[best + 1]);
        out.conductance_G0 = g0(best);
        out.points_in_contact = best + 1;
        out.gap_offset_m = contact_distance_m - out.z_m;
    }
    return out;
}

}  // namespace tipgap::detail
