// The x–y panel: bands, reference lines, series, notes, legend.
#include <cmath>
#include <utility>
#include <fmt/format.h>

#include "plot/detail/plot_draw.hpp"
#include "plot/detail/plot_style.hpp"

namespace tipgap::plot::detail {

namespace {

std::vector<double> transformed(const std::vector<double>& v, axis_scale s) {
    std::vector<double> out(v.size());
    for (std::size_t i = 0; i < v.size(); ++i) out[i] = to_plot(v[i], s);
    return out;
}

std::string item_name(const char* kind, std::size_t i, const std::string& label) {
    return label.empty() ? fmt::format("{} {}", kind, i + 1) : fmt::format("{} {} '{}'", kind, i + 1, label);
}

// The looks the series use: explicit ones as given, the rest in order skipping taken ones.
std::vector<int> assign_looks(const std::vector<series>& lines) {
    std::vector<int> looks(lines.size());
    std::vector<bool> taken(look_count, false);
    for (const series& s : lines)
        if (s.look >= 0) taken[static_cast<std::size_t>(s.look) % look_count] = true;
    int next = 0;
    for (std::size_t i = 0; i < lines.size(); ++i) {
        if (lines[i].look >= 0) {
            looks[i] = lines[i].look;
            continue;
        }
        int tries = 0;
        while (taken[static_cast<std::size_t>(next) % look_count] && tries++ < static_cast<int>(look_count)) ++next;
        looks[i] = next;
        taken[static_cast<std::size_t>(next) % look_count] = true;
        ++next;
    }
    return looks;
}

}  // namespace

void validate_xy(const xy_panel& p, const location& where) {
    validate_axis(p.x_axis, "x axis", where);
    validate_axis(p.y_axis, "y axis", where);
    for (std::size_t i = 0; i < p.lines.size(); ++i) {
        const series& s = p.lines[i];
        if (s.x.size() != s.y.size())
            throw_input(where, fmt::format("{}: x and y differ in length ({} and {})", item_name("series", i, s.label),
                                           s.x.size(), s.y.size()));
    }
    for (std::size_t i = 0; i < p.bands.size(); ++i) {
        const band& b = p.bands[i];
        if (b.y_low.size() != b.x.size() || b.y_high.size() != b.x.size())
            throw_input(where, fmt::format("{}: x, y_low and y_high differ in length ({}, {} and {})",
                                           item_name("band", i, b.label), b.x.size(), b.y_low.size(), b.y_high.size()));
        if (b.look < 0) throw_input(where, fmt::format("{}: look must be >= 0", item_name("band", i, b.label)));
    }
    for (std::size_t i = 0; i < p.references.size(); ++i)
        if (!std::isfinite(p.references[i].value))
            throw_input(where, fmt::format("{}: value is not a finite number",
                                           item_name("reference line", i, p.references[i].label)));
    for (std::size_t i = 0; i < p.notes.size(); ++i)
        if (!std::isfinite(p.notes[i].x) || !std::isfinite(p.notes[i].y))
            throw_input(where, fmt::format("annotation {}: position is not finite", i + 1));
}

namespace {

// Every drawn point in plot coordinates, lines densified so that a legend cannot hide a segment
// between two distant points, bands filled in with their middle.
std::vector<std::pair<double, double>> drawn_points(const xy_panel& p, const range& rx, const range& ry) {
    const axis_scale sx = p.x_axis.scale, sy = p.y_axis.scale;
    std::vector<std::pair<double, double>> pts;
    constexpr int steps = 8;  // points per segment: legend boxes are far wider than 1/8 of a segment
    auto add_segment = [&](double x0, double y0, double x1, double y1) {
        if (!std::isfinite(x0) || !std::isfinite(y0) || !std::isfinite(x1) || !std::isfinite(y1)) return;
        for (int k = 0; k <= steps; ++k) pts.emplace_back(x0 + (x1 - x0) * k / steps, y0 + (y1 - y0) * k / steps);
    };
    for (const series& s : p.lines)
        for (std::size_t i = 0; i < s.x.size(); ++i) {
            const double x = to_plot(s.x[i], sx), y = to_plot(s.y[i], sy);
            if (std::isfinite(x) && std::isfinite(y)) pts.emplace_back(x, y);
            if (s.style != draw_style::markers && i + 1 < s.x.size())
                add_segment(x, y, to_plot(s.x[i + 1], sx), to_plot(s.y[i + 1], sy));
        }
    for (const band& b : p.bands)
        for (std::size_t i = 0; i < b.x.size(); ++i)
            add_segment(to_plot(b.x[i], sx), to_plot(b.y_low[i], sy), to_plot(b.x[i], sx), to_plot(b.y_high[i], sy));
    for (const reference_line& r : p.references) {
        if (r.direction == orientation::horizontal) add_segment(rx.lo, to_plot(r.value, sy), rx.hi, to_plot(r.value, sy));
        else add_segment(to_plot(r.value, sx), ry.lo, to_plot(r.value, sx), ry.hi);
    }
    return pts;
}

// Legend order: series, then bands, then reference lines (what the reader looks for first).
std::vector<legend_entry> legend_entries(const xy_panel& p, const std::vector<int>& looks) {
    std::vector<legend_entry> legend;
    for (std::size_t i = 0; i < p.lines.size(); ++i) {
        const series& s = p.lines[i];
        const look& l = look_at(looks[i]);
        const bool line = s.style != draw_style::markers, marks = s.style != draw_style::line;
        if (!s.label.empty())
            legend.push_back({legend_entry::kind::line, s.label, ci_look + looks[i] % static_cast<int>(look_count), line,
                              l.dash, series_width, marks ? l.marker : ""});
    }
    for (const band& b : p.bands)
        if (!b.label.empty())
            legend.push_back({legend_entry::kind::box, b.label,
                              b.fill == band_fill::grey ? ci_band_grey : ci_tint + b.look % static_cast<int>(look_count),
                              false, {}, 0.0, ""});
    for (std::size_t i = 0; i < p.references.size(); ++i)
        if (!p.references[i].label.empty())
            legend.push_back({legend_entry::kind::line, p.references[i].label, ci_reference, true,
                              reference_dash(static_cast<int>(i)), reference_width, ""});
    return legend;
}

// A band: a polygon along the upper edge and back along the lower one, per finite run; grey bands
// also get their edges drawn.
void draw_band(plstream& pls, const band& b, axis_scale sx, axis_scale sy) {
    std::vector<PLFLT> px, py;
    auto flush = [&](std::size_t from, std::size_t to) {
        px.clear();
        py.clear();
        for (std::size_t i = from; i < to; ++i) {
            px.push_back(to_plot(b.x[i], sx));
            py.push_back(to_plot(b.y_high[i], sy));
        }
        for (std::size_t i = to; i-- > from;) {
            px.push_back(to_plot(b.x[i], sx));
            py.push_back(to_plot(b.y_low[i], sy));
        }
        if (px.size() < 4) return;
        pls.col0(b.fill == band_fill::grey ? ci_band_grey : ci_tint + b.look % static_cast<int>(look_count));
        pls.psty(0);
        pls.fill(static_cast<PLINT>(px.size()), px.data(), py.data());
        if (b.fill != band_fill::grey) return;
        const std::size_t n = px.size() / 2;
        pls.col0(ci_band_edge);
        pls.width(0.8);
        pls.lsty(1);
        pls.line(static_cast<PLINT>(n), px.data(), py.data());
        pls.line(static_cast<PLINT>(n), px.data() + n, py.data() + n);
    };
    std::size_t start = 0;
    for (std::size_t i = 0; i <= b.x.size(); ++i) {
        const bool ok = i < b.x.size() && std::isfinite(to_plot(b.x[i], sx)) && std::isfinite(to_plot(b.y_low[i], sy)) &&
                        std::isfinite(to_plot(b.y_high[i], sy));
        if (!ok) {
            flush(start, i);
            start = i + 1;
        }
    }
}

void draw_references(plstream& pls, const xy_panel& p, const range& rx, const range& ry) {
    for (std::size_t i = 0; i < p.references.size(); ++i) {
        const reference_line& r = p.references[i];
        pls.col0(ci_reference);
        pls.width(reference_width);
        apply_dash(pls, reference_dash(static_cast<int>(i)));
        if (r.direction == orientation::horizontal) {
            const double v = to_plot(r.value, p.y_axis.scale);
            if (std::isfinite(v)) pls.join(rx.lo, v, rx.hi, v);
        } else {
            const double v = to_plot(r.value, p.x_axis.scale);
            if (std::isfinite(v)) pls.join(v, ry.lo, v, ry.hi);
        }
    }
    pls.lsty(1);
}

void draw_series(plstream& pls, const xy_panel& p, const std::vector<int>& looks) {
    for (std::size_t i = 0; i < p.lines.size(); ++i) {
        const series& s = p.lines[i];
        const look& l = look_at(looks[i]);
        const std::vector<double> x = transformed(s.x, p.x_axis.scale), y = transformed(s.y, p.y_axis.scale);
        pls.col0(ci_look + looks[i] % static_cast<int>(look_count));
        if (s.style != draw_style::markers) {
            pls.width(series_width);
            apply_dash(pls, l.dash);
            draw_broken_line(pls, x, y);
            pls.lsty(1);
        }
        if (s.style != draw_style::line) draw_markers(pls, x, y, l.marker);
    }
}

// Ranges from everything drawn in data units; reference lines count too so they stay in view.
void xy_ranges(const xy_panel& p, range& rx, range& ry) {
    const axis_scale sx = p.x_axis.scale, sy = p.y_axis.scale;
    std::vector<double> all_x, all_y;
    for (const series& s : p.lines)
        for (std::size_t i = 0; i < s.x.size(); ++i) {
            const double px = to_plot(s.x[i], sx), py = to_plot(s.y[i], sy);
            if (std::isfinite(px) && std::isfinite(py)) {  // a point only counts when it is drawn
                all_x.push_back(px);
                all_y.push_back(py);
            }
        }
    for (const band& b : p.bands)
        for (std::size_t i = 0; i < b.x.size(); ++i) {
            all_x.push_back(to_plot(b.x[i], sx));
            all_y.push_back(to_plot(b.y_low[i], sy));
            all_y.push_back(to_plot(b.y_high[i], sy));
        }
    for (const reference_line& r : p.references)
        (r.direction == orientation::vertical ? all_x : all_y).push_back(to_plot(r.value, r.direction == orientation::vertical ? sx : sy));
    rx = display_range(all_x, p.x_axis);
    ry = display_range(all_y, p.y_axis);
}

void draw_notes(plstream& pls, const xy_panel& p) {
    pls.col0(ci_ink);
    pls.schr(0, note_scale);
    for (const annotation& a : p.notes) {
        const double x = to_plot(a.x, p.x_axis.scale), y = to_plot(a.y, p.y_axis.scale);
        if (std::isfinite(x) && std::isfinite(y)) pls.ptex(x, y, 1.0, 0.0, a.justification, plplot_text(a.text).c_str());
    }
    pls.schr(0, 1.0);
}

}  // namespace

xy_layout layout_xy(const xy_panel& p, double plot_width_mm, double plot_height_mm, double text_height_mm) {
    xy_layout out;
    xy_ranges(p, out.x, out.y);
    out.looks = assign_looks(p.lines);
    out.legend = legend_entries(p, out.looks);
    out.corner = p.legend;
    if (out.legend.empty() || p.legend == legend_position::none) return out;
    const legend_box box = legend_size(out.legend, text_height_mm);
    // Twice the inset: the box keeps that much clear of the data on its open sides too.
    const double w = (box.width_mm + 2 * box.inset_mm) / plot_width_mm, h = (box.height_mm + 2 * box.inset_mm) / plot_height_mm;
    // An explicit y max stays: the user asked for that range.
    const legend_placement where = place_legend(drawn_points(p, out.x, out.y), out.x, out.y, w, h, p.legend);
    out.corner = where.corner;
    if (!p.y_axis.max) out.y.hi = where.y_hi;
    return out;
}

void draw_xy(plstream& pls, const xy_panel& p, const cell& c) {
    set_viewport(pls, c, margins{});
    PLFLT vx0, vx1, vy0, vy1, def_mm, height_mm;
    pls.gvpd(vx0, vx1, vy0, vy1);
    pls.gchr(def_mm, height_mm);
    const xy_layout lay = layout_xy(p, (vx1 - vx0) * c.page_width_mm, (vy1 - vy0) * c.page_height_mm, height_mm);
    pls.wind(lay.x.lo, lay.x.hi, lay.y.lo, lay.y.hi);
    draw_grid(pls, p.x_axis, p.y_axis);
    for (const band& b : p.bands) draw_band(pls, b, p.x_axis.scale, p.y_axis.scale);
    draw_references(pls, p, lay.x, lay.y);
    draw_series(pls, p, lay.looks);
    draw_notes(pls, p);

    draw_frame(pls, p.title, p.x_axis, p.y_axis);
    draw_legend(pls, lay.legend, lay.corner, c);
}

}  // namespace tipgap::plot::detail
