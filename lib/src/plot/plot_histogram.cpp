// The histogram panel and its binning.
#include <algorithm>
#include <cmath>
#include <fmt/format.h>

#include "core/detail/quantile.hpp"
#include "plot/detail/plot_draw.hpp"
#include "plot/detail/plot_style.hpp"

namespace tipgap::plot {

namespace {

constexpr int max_bins = 10000;      // more bars than any page has pixels
constexpr int max_auto_bins = 200;  // beyond this bars are thinner than a line: common practice, no source

void check_edges(const std::vector<double>& edges, const location& where) {
    if (edges.size() < 2) throw_input(where, "histogram: edges need at least 2 values");
    for (std::size_t i = 0; i < edges.size(); ++i)
        if (!std::isfinite(edges[i]) || (i > 0 && !(edges[i] > edges[i - 1])))
            throw_input(where, "histogram: edges must be finite and strictly ascending");
}

}  // namespace

histogram_bins make_histogram(const std::vector<double>& values, int bins, const std::vector<double>& edges) {
    histogram_bins out;
    if (bins < 0 || bins > max_bins)
        throw_input({}, fmt::format("histogram: bin count {} is out of range; expected 0 (automatic) to {}", bins, max_bins));
    std::vector<double> finite;
    finite.reserve(values.size());
    for (double v : values)
        if (std::isfinite(v)) finite.push_back(v);
    out.left_out = values.size() - finite.size();

    if (!edges.empty()) {
        check_edges(edges, {});
        out.edges = edges;
    } else {
        std::sort(finite.begin(), finite.end());
        double lo = finite.empty() ? 0.0 : finite.front(), hi = finite.empty() ? 1.0 : finite.back();
        if (hi == lo) {  // one distinct value: one bar around it
            const double half = lo == 0.0 ? 0.5 : 0.05 * std::abs(lo);
            lo -= half;
            hi += half;
            if (bins == 0) bins = 1;
        }
        if (bins == 0) {
            // Freedman & Diaconis, Z. Wahrscheinlichkeitstheorie verw. Gebiete 57, 453 (1981):
            // width 2 IQR n^(-1/3). Sturges' ceil(log2 n) + 1 when the IQR is zero.
            const double n = static_cast<double>(finite.size());
            const double iqr = finite.size() >= 2 ? tipgap::detail::quantile_sorted(finite, 0.75) - tipgap::detail::quantile_sorted(finite, 0.25) : 0.0;
            if (iqr > 0) bins = static_cast<int>(std::ceil((hi - lo) / (2.0 * iqr * std::cbrt(1.0 / n))));
            else bins = static_cast<int>(std::ceil(std::log2(std::max(n, 1.0)))) + 1;
            bins = std::clamp(bins, 1, max_auto_bins);
        }
        out.edges.resize(static_cast<std::size_t>(bins) + 1);
        for (int i = 0; i <= bins; ++i) out.edges[static_cast<std::size_t>(i)] = lo + (hi - lo) * i / bins;
        out.edges.back() = hi;  // exactly, so the maximum lands in the last bin
    }

    out.counts.assign(out.edges.size() - 1, 0);
    const double first = out.edges.front(), last = out.edges.back();
    for (double v : finite) {
        if (v < first || v > last) {
            ++out.left_out;
            continue;
        }
        // upper_bound gives the first edge > v; the bin is the one before it (last bin closed).
        auto it = std::upper_bound(out.edges.begin(), out.edges.end(), v);
        std::size_t bin = static_cast<std::size_t>(it - out.edges.begin());
        bin = bin == 0 ? 0 : bin - 1;
        if (bin >= out.counts.size()) bin = out.counts.size() - 1;
        ++out.counts[bin];
    }
    return out;
}

namespace detail {

void validate_histogram(const histogram_panel& p, const location& where) {
    validate_axis(p.x_axis, "x axis", where);
    if (p.x_axis.scale != axis_scale::linear) throw_input(where, "histogram: the x axis must be linear");
    if (p.bins < 0 || p.bins > max_bins)
        throw_input(where, fmt::format("histogram: bin count {} is out of range; expected 0 (automatic) to {}", p.bins,
                                       max_bins));
    if (!p.edges.empty()) check_edges(p.edges, where);
    for (const reference_line& r : p.markers)
        if (!std::isfinite(r.value)) throw_input(where, "histogram: a marker value is not a finite number");
}

void draw_histogram(plstream& pls, const histogram_panel& p, const cell& c) {
    const histogram_bins h = make_histogram(p.values, p.bins, p.edges);
    std::size_t top = 0;
    for (std::size_t n : h.counts) top = std::max(top, n);

    std::vector<double> xs{h.edges.front(), h.edges.back()};
    for (const reference_line& r : p.markers) xs.push_back(r.value);
    const range rx = display_range(xs, p.x_axis);
    axis count_axis{p.y_label, axis_scale::linear, 0.0, std::nullopt};
    // Headroom above the tallest bar for the legend.
    const range ry{0.0, std::max(1.0, static_cast<double>(top) * 1.25)};

    set_viewport(pls, c, margins{});
    pls.wind(rx.lo, rx.hi, ry.lo, ry.hi);
    draw_grid(pls, p.x_axis, count_axis);

    for (std::size_t i = 0; i < h.counts.size(); ++i) {
        if (h.counts[i] == 0) continue;
        const double y = static_cast<double>(h.counts[i]);
        PLFLT bx[4] = {h.edges[i], h.edges[i + 1], h.edges[i + 1], h.edges[i]};
        PLFLT by[4] = {0.0, 0.0, y, y};
        pls.col0(ci_bar_fill);
        pls.psty(0);
        pls.fill(4, bx, by);
        PLFLT ox[5] = {h.edges[i], h.edges[i], h.edges[i + 1], h.edges[i + 1], h.edges[i]};
        PLFLT oy[5] = {0.0, y, y, 0.0, 0.0};
        pls.col0(ci_bar_edge);
        pls.width(0.8);
        pls.line(5, ox, oy);
    }

    std::vector<legend_entry> legend;
    for (std::size_t i = 0; i < p.markers.size(); ++i) {
        const reference_line& r = p.markers[i];
        const dash_pattern dash = reference_dash(static_cast<int>(i));
        pls.col0(ci_reference);
        pls.width(series_width);
        apply_dash(pls, dash);
        pls.join(r.value, ry.lo, r.value, ry.hi);
        if (!r.label.empty()) legend.push_back({legend_entry::kind::line, r.label, ci_reference, true, dash, series_width, ""});
    }
    pls.lsty(1);
    if (h.left_out > 0)
        legend.push_back({legend_entry::kind::text, fmt::format("{} of {} values not shown", h.left_out, p.values.size()),
                          ci_ink, false, {}, 0.0, ""});

    draw_frame(pls, p.title, p.x_axis, count_axis);
    draw_legend(pls, legend, p.legend == legend_position::best ? legend_position::top_right : p.legend, c);
}

}  // namespace detail
}  // namespace tipgap::plot
