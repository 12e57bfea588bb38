// The x–y panel: bands, reference lines, series, notes, legend.
#include <cmath>
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

// One band: a polygon along the upper edge and back along the lower one, per finite run.
void fill_band(plstream& pls, const band& b, axis_scale sx, axis_scale sy) {
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
        if (px.size() >= 4) pls.fill(static_cast<PLINT>(px.size()), px.data(), py.data());
    };
    std::size_t start = 0;
    for (std::size_t i = 0; i <= b.x.size(); ++i) {
        const bool ok = i < b.x.size() && std::isfinite(to_plot(b.x[i], sx)) &&
                        std::isfinite(to_plot(b.y_low[i], sy)) && std::isfinite(to_plot(b.y_high[i], sy));
        if (!ok) {
            flush(start, i);
            start = i + 1;
        }
    }
}

// Bands, in their tints; returns their legend keys.
std::vector<legend_entry> draw_bands(plstream& pls, const xy_panel& p) {
    std::vector<legend_entry> keys;
    for (const band& b : p.bands) {
        pls.col0(ci_tint + b.look % static_cast<int>(look_count));
        pls.psty(0);
        fill_band(pls, b, p.x_axis.scale, p.y_axis.scale);
        if (!b.label.empty())
            keys.push_back({legend_entry::kind::box, b.label, ci_tint + b.look % static_cast<int>(look_count), false, {}, 0.0, ""});
    }
    return keys;
}

// Reference lines across the whole range, each with its own dash; returns their legend keys.
std::vector<legend_entry> draw_references(plstream& pls, const xy_panel& p, const range& rx, const range& ry) {
    std::vector<legend_entry> keys;
    for (std::size_t i = 0; i < p.references.size(); ++i) {
        const reference_line& r = p.references[i];
        const dash_pattern dash = reference_dash(static_cast<int>(i));
        pls.col0(ci_reference);
        pls.width(reference_width);
        apply_dash(pls, dash);
        if (r.direction == orientation::horizontal) {
            const double v = to_plot(r.value, p.y_axis.scale);
            if (std::isfinite(v)) pls.join(rx.lo, v, rx.hi, v);
        } else {
            const double v = to_plot(r.value, p.x_axis.scale);
            if (std::isfinite(v)) pls.join(v, ry.lo, v, ry.hi);
        }
        if (!r.label.empty()) keys.push_back({legend_entry::kind::line, r.label, ci_reference, true, dash, reference_width, ""});
    }
    pls.lsty(1);
    return keys;
}

// Series in their looks (line, markers or both); returns their legend entries.
std::vector<legend_entry> draw_series(plstream& pls, const xy_panel& p) {
    std::vector<legend_entry> legend;
    const std::vector<int> looks = assign_looks(p.lines);
    for (std::size_t i = 0; i < p.lines.size(); ++i) {
        const series& s = p.lines[i];
        const look& l = look_at(looks[i]);
        const int colour = ci_look + looks[i] % static_cast<int>(look_count);
        const std::vector<double> x = transformed(s.x, p.x_axis.scale), y = transformed(s.y, p.y_axis.scale);
        const bool line = s.style != draw_style::markers, marks = s.style != draw_style::line;
        pls.col0(colour);
        if (line) {
            pls.width(series_width);
            apply_dash(pls, l.dash);
            draw_broken_line(pls, x, y);
            pls.lsty(1);
        }
        if (marks) draw_markers(pls, x, y, l.marker);
        if (!s.label.empty())
            legend.push_back({legend_entry::kind::line, s.label, colour, line, l.dash, series_width, marks ? l.marker : ""});
    }
    return legend;
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

void draw_xy(plstream& pls, const xy_panel& p, const cell& c) {
    range rx, ry;
    xy_ranges(p, rx, ry);
    set_viewport(pls, c, margins{});
    pls.wind(rx.lo, rx.hi, ry.lo, ry.hi);
    draw_grid(pls, p.x_axis, p.y_axis);

    // Drawn bands first (underneath), then reference lines, series and notes. Legend order:
    // series, then bands, then reference lines (what the reader looks for first).
    const std::vector<legend_entry> band_keys = draw_bands(pls, p);
    const std::vector<legend_entry> reference_keys = draw_references(pls, p, rx, ry);
    std::vector<legend_entry> legend = draw_series(pls, p);
    draw_notes(pls, p);

    draw_frame(pls, p.title, p.x_axis, p.y_axis);
    legend.insert(legend.end(), band_keys.begin(), band_keys.end());
    legend.insert(legend.end(), reference_keys.begin(), reference_keys.end());
    draw_legend(pls, legend, p.legend, c);
}

}  // namespace tipgap::plot::detail
