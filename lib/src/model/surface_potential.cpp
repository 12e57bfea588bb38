// The finite potential of the exact solver: the image-lowered barrier, clamped at the band bottom
// of the nearer electrode (surface model documented in tipgap/model/exact_transmission.hpp).
#include <algorithm>

#include "tipgap/core/constants.hpp"
#include "tipgap/model/exact_transmission.hpp"

namespace tipgap {
namespace {

// Appends [lo, hi] unless it is empty; joins it to the previous piece when both are smooth.
void append(std::vector<potential_piece>& out, double lo, double hi, bool clamped, double value) {
    if (!(hi > lo)) return;
    if (!out.empty() && !clamped && !out.back().clamped && out.back().hi_m == lo) {
        out.back().hi_m = hi;
        return;
    }
    out.push_back({lo, hi, clamped, clamped ? value : 0.0});
}

}  // namespace

surface_potential::surface_potential(const model_options& o, double s, double V)
    : raw_(o, s, V),
      tip_bottom_(-o.tip.fermi_energy_J),
      sample_bottom_(-si::elementary_charge * V - o.sample.fermi_energy_J) {
    const double mid = 0.5 * s;
    // {U > bottom} is one interval because U is concave (the image term is concave and the rest
    // linear); outside it, on the electrode's own half, the potential is the band bottom.
    double a1 = mid, a2 = mid;  // tip half: U above the tip band bottom on (a1, a2) ∩ (0, mid)
    if (raw_.forbidden_interval(tip_bottom_, a1, a2)) {
        a1 = std::min(a1, mid);
        a2 = std::min(a2, mid);
    } else {
        a1 = a2 = mid;
    }
    double b1 = mid, b2 = mid;  // sample half
    if (raw_.forbidden_interval(sample_bottom_, b1, b2)) {
        b1 = std::max(b1, mid);
        b2 = std::max(b2, mid);
    } else {
        b1 = b2 = mid;
    }
    append(pieces_, 0.0, a1, true, tip_bottom_);
    append(pieces_, a1, a2, false, 0.0);
    append(pieces_, a2, mid, true, tip_bottom_);
    append(pieces_, mid, b1, true, sample_bottom_);
    append(pieces_, b1, b2, false, 0.0);
    append(pieces_, b2, s, true, sample_bottom_);
}

double surface_potential::potential_J(double x) const {
    const double s = raw_.gap_m();
    const double bottom = x < 0.5 * s ? tip_bottom_ : sample_bottom_;
    // The unclamped U is only evaluated strictly inside the gap, where it is finite.
    for (const potential_piece& p : pieces_) {
        if (x >= p.lo_m && x <= p.hi_m) {
            return p.clamped ? p.value_J : std::max(raw_.potential_J(std::clamp(x, p.lo_m, p.hi_m)), bottom);
        }
    }
    return bottom;
}

}  // namespace tipgap
