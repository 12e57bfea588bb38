// Shared pieces of every panel: viewport, axis ranges, grid, frame, legend, broken lines.
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <fmt/format.h>
#include <limits>

#include "plot/detail/plot_draw.hpp"
#include "plot/detail/plot_style.hpp"

namespace tipgap::plot::detail {

void set_viewport(plstream& pls, const cell& c, const margins& m) {
    // Margins are in text heights converted to page fractions, so a bigger panel gets more plot
    // area and the same type size rather than bigger type.
    PLFLT def_mm = 0, height_mm = 0;
    pls.gchr(def_mm, height_mm);
    const double mx = height_mm / c.page_width_mm, my = height_mm / c.page_height_mm;
    pls.vpor(c.x0 + m.left * mx, c.x1 - m.right * mx, c.y0 + m.bottom * my, c.y1 - m.top * my);
}

double to_plot(double v, axis_scale s) {
    if (!std::isfinite(v)) return std::numeric_limits<double>::quiet_NaN();
    if (s == axis_scale::log10) return v > 0 ? std::log10(v) : std::numeric_limits<double>::quiet_NaN();
    return v;
}

range display_range(const std::vector<double>& plot_values, const axis& a) {
    double lo = std::numeric_limits<double>::infinity(), hi = -lo;
    for (double v : plot_values)
        if (std::isfinite(v)) {
            lo = std::min(lo, v);
            hi = std::max(hi, v);
        }
    const bool log = a.scale == axis_scale::log10;
    const bool fixed_lo = a.min.has_value(), fixed_hi = a.max.has_value();
    if (fixed_lo) lo = to_plot(*a.min, a.scale);
    if (fixed_hi) hi = to_plot(*a.max, a.scale);
    if (!std::isfinite(lo) && !std::isfinite(hi)) {  // nothing to show
        lo = 0.0;
        hi = 1.0;
    } else if (!std::isfinite(lo)) {
        lo = hi - 1.0;
    } else if (!std::isfinite(hi)) {
        hi = lo + 1.0;
    }
    if (hi == lo) {
        const double half = log ? 0.5 : (lo == 0.0 ? 1.0 : 0.1 * std::abs(lo));
        if (!fixed_lo) lo -= half;
        if (!fixed_hi) hi += half;
        if (hi == lo) hi = lo + 2 * half;
    }
    if (log) {
        // Whole decades: PLplot labels a log axis at its decades only.
        if (!fixed_lo) lo = std::floor(lo + 1e-9);
        if (!fixed_hi) hi = std::ceil(hi - 1e-9);
        if (hi <= lo) hi = lo + 1.0;
    } else {
        const double pad = 0.04 * (hi - lo);
        if (!fixed_lo) lo -= pad;
        if (!fixed_hi) hi += pad;
    }
    return {lo, hi};
}

std::string box_options(const axis& a, double span, bool y) {
    std::string o = "bcnt";
    if (a.scale == axis_scale::log10) {
        o += 'l';
        // Minor ticks at 2..9 of every decade crowd an axis of many decades into a dark band.
        if (std::abs(span) <= max_minor_decades) o += 's';
    } else {
        o += "so";  // 'o': our own labels, so PLplot never moves an exponent above the panel
    }
    if (y) o += 'v';  // y numbers upright: they are read, not decoded
    return o;
}

double tick_step(double span) {
    span = std::abs(span);
    if (!(span > 0) || !std::isfinite(span)) return 0.0;
    // 1, 2 or 5 times a power of ten, giving four to eight ticks (common practice, no source).
    const double raw = span / 5.0, mag = std::pow(10.0, std::floor(std::log10(raw))), norm = raw / mag;
    return (norm < 1.5 ? 1.0 : norm < 3.0 ? 2.0 : norm < 7.0 ? 5.0 : 10.0) * mag;
}

std::string tick_label(double value, double span) {
    const double step = tick_step(span);
    if (!(step > 0)) return fmt::format("{:g}", value);
    if (std::abs(value) < 1e-6 * step) value = 0.0;  // no "-0" or "1e-17" at zero
    if (std::abs(value) >= 1e6) return fmt::format("{:.6g}", value);
    // The step's last significant digit is the last one that differs between neighbouring labels.
    const int decimals = std::clamp(static_cast<int>(-std::floor(std::log10(step) + 1e-9)), 0, 12);
    return fmt::format("{:.{}f}", value, decimals);
}

namespace {

struct window_spans {
    double x = 1, y = 1;
};

void label_callback(PLINT which, PLFLT value, char* label, PLINT length, PLPointer data) {
    const auto* spans = static_cast<const window_spans*>(data);
    const std::string text = tick_label(value, which == PL_Y_AXIS ? spans->y : spans->x);
    std::snprintf(label, static_cast<std::size_t>(length), "%s", text.c_str());
}

window_spans current_spans(plstream& pls) {
    PLFLT x0, x1, y0, y1;
    pls.gvpw(x0, x1, y0, y1);
    return {x1 - x0, y1 - y0};
}

}  // namespace

void draw_grid(plstream& pls, const axis& x, const axis& y) {
    pls.col0(ci_grid);
    pls.width(0.6);
    pls.lsty(1);
    const window_spans w = current_spans(pls);
    const bool lx = x.scale == axis_scale::log10, ly = y.scale == axis_scale::log10;
    pls.box(lx ? "gl" : "g", lx ? 0 : tick_step(w.x), 0, ly ? "gl" : "g", ly ? 0 : tick_step(w.y), 0);
}

void draw_frame(plstream& pls, const std::string& title, const axis& x, const axis& y) {
    pls.col0(ci_ink);
    pls.width(frame_width);
    pls.lsty(1);
    window_spans spans = current_spans(pls);
    pls.slabelfunc(label_callback, &spans);
    const bool lx = x.scale == axis_scale::log10, ly = y.scale == axis_scale::log10;
    pls.box(box_options(x, spans.x, false).c_str(), lx ? 0 : tick_step(spans.x), 0, box_options(y, spans.y, true).c_str(),
            ly ? 0 : tick_step(spans.y), 0);
    pls.slabelfunc(nullptr, nullptr);
    pls.mtex("b", 3.2, 0.5, 0.5, plplot_text(x.label).c_str());
    pls.mtex("l", 6.2, 0.5, 0.5, plplot_text(y.label).c_str());
    if (!title.empty()) {
        pls.schr(0, title_scale);
        pls.sfont(PL_FCI_SANS, PL_FCI_UPRIGHT, PL_FCI_BOLD);
        pls.mtex("t", 1.5, 0.0, 0.0, plplot_text(title).c_str());
        pls.sfont(PL_FCI_SANS, PL_FCI_UPRIGHT, PL_FCI_MEDIUM);
        pls.schr(0, 1.0);
    }
}

namespace {
std::size_t code_points(const std::string& s) {
    std::size_t n = 0;
    for (unsigned char ch : s)
        if ((ch & 0xC0) != 0x80) ++n;
    return n;
}
}  // namespace

legend_box legend_size(const std::vector<legend_entry>& entries, double text_height_mm) {
    const double th = text_height_mm * note_scale;
    const double row = 1.8 * th, pad = 0.8 * th, sample = 4.5 * th, gap = 0.8 * th;
    std::size_t longest = 0;
    for (const legend_entry& e : entries) longest = std::max(longest, code_points(e.text));
    const bool has_samples = std::any_of(entries.begin(), entries.end(), [](const legend_entry& e) { return e.what != legend_entry::kind::text; });
    const double text_x = pad + (has_samples ? sample + gap : 0.0);
    return {text_x + 0.7 * th * static_cast<double>(longest) + pad, 2 * 0.5 * pad + row * static_cast<double>(entries.size()),
            0.8 * th};
}

namespace {

// Points of `pts` inside the box of size (w, h) in the corner of the window (x, y) (fractions).
std::size_t covered(const std::vector<std::pair<double, double>>& pts, const range& x, const range& y, double w,
                    double h, legend_position corner) {
    const bool right = corner == legend_position::top_right || corner == legend_position::bottom_right;
    const bool top = corner == legend_position::top_right || corner == legend_position::top_left;
    const double sx = x.hi - x.lo, sy = y.hi - y.lo;
    const double bx0 = right ? x.hi - w * sx : x.lo, bx1 = right ? x.hi : x.lo + w * sx;
    const double by0 = top ? y.hi - h * sy : y.lo, by1 = top ? y.hi : y.lo + h * sy;
    std::size_t n = 0;
    for (const auto& [px, py] : pts)
        if (px >= bx0 && px <= bx1 && py >= by0 && py <= by1) ++n;
    return n;
}

}  // namespace

legend_placement place_legend(const std::vector<std::pair<double, double>>& points, const range& x, const range& y,
                              double box_w, double box_h, legend_position requested) {
    if (requested != legend_position::best) return {requested, y.hi};
    legend_placement best{legend_position::top_right, y.hi};
    std::size_t fewest = std::numeric_limits<std::size_t>::max();
    for (legend_position corner : {legend_position::top_right, legend_position::top_left, legend_position::bottom_right,
                                   legend_position::bottom_left}) {
        const std::size_t n = covered(points, x, y, box_w, box_h, corner);
        if (n < fewest) {
            fewest = n;
            best.corner = corner;
        }
    }
    if (fewest == 0 || box_h >= 0.6) return best;  // a legend taller than that would squash the data
    // Raise the top so the legend's lower edge clears the highest point under either top corner:
    // with y_hi = lo + (top - lo) / (1 - h), the top h of the window lies above `top`.
    double top_point = y.lo;
    const double sx = x.hi - x.lo;
    for (legend_position corner : {legend_position::top_right, legend_position::top_left}) {
        const bool right = corner == legend_position::top_right;
        const double bx0 = right ? x.hi - box_w * sx : x.lo, bx1 = right ? x.hi : x.lo + box_w * sx;
        double highest = y.lo;
        for (const auto& [px, py] : points)
            if (px >= bx0 && px <= bx1 && py <= y.hi) highest = std::max(highest, py);
        const double y_hi = y.lo + (highest - y.lo) / (1.0 - box_h) + 0.02 * (y.hi - y.lo);
        if (corner == legend_position::top_right || y_hi < top_point) {
            top_point = y_hi;
            best.corner = corner;
        }
    }
    best.y_hi = std::max(y.hi, top_point);
    return best;
}

void draw_legend(plstream& pls, const std::vector<legend_entry>& entries, legend_position where, const cell& c) {
    if (entries.empty() || where == legend_position::none) return;
    PLFLT vx0, vx1, vy0, vy1, wx0, wx1, wy0, wy1, def_mm, height_mm;
    pls.gvpd(vx0, vx1, vy0, vy1);
    pls.gvpw(wx0, wx1, wy0, wy1);
    pls.gchr(def_mm, height_mm);

    // Geometry in millimetres on the page.
    const double th = height_mm * note_scale;
    const double row = 1.8 * th, pad = 0.8 * th, sample = 4.5 * th;
    const legend_box size = legend_size(entries, height_mm);
    const double box_w = size.width_mm, box_h = size.height_mm, inset = size.inset_mm;
    const bool has_samples = std::any_of(entries.begin(), entries.end(), [](const legend_entry& e) { return e.what != legend_entry::kind::text; });
    const double text_x = pad + (has_samples ? sample + 0.8 * th : 0.0);
    const double view_w = (vx1 - vx0) * c.page_width_mm, view_h = (vy1 - vy0) * c.page_height_mm;
    const bool right = where == legend_position::top_right || where == legend_position::bottom_right;
    const bool top = where == legend_position::top_right || where == legend_position::top_left;
    const double bx = right ? view_w - inset - box_w : inset, by = top ? view_h - inset - box_h : inset;

    pls.vpor(vx0 + bx / c.page_width_mm, vx0 + (bx + box_w) / c.page_width_mm, vy0 + by / c.page_height_mm,
             vy0 + (by + box_h) / c.page_height_mm);
    pls.wind(0, box_w, 0, box_h);
    PLFLT fx[4] = {0, box_w, box_w, 0}, fy[4] = {0, 0, box_h, box_h};
    pls.col0(ci_background);
    pls.psty(0);
    pls.fill(4, fx, fy);
    pls.col0(ci_legend_frame);
    pls.width(frame_width);
    pls.lsty(1);
    PLFLT ox[5] = {0, box_w, box_w, 0, 0}, oy[5] = {0, 0, box_h, box_h, 0};
    pls.line(5, ox, oy);

    for (std::size_t i = 0; i < entries.size(); ++i) {
        const legend_entry& e = entries[i];
        const double yc = box_h - 0.5 * pad - row * (static_cast<double>(i) + 0.5);
        if (e.what == legend_entry::kind::box) {
            PLFLT sx[4] = {pad, pad + sample, pad + sample, pad};
            PLFLT sy[4] = {yc - 0.32 * row, yc - 0.32 * row, yc + 0.32 * row, yc + 0.32 * row};
            pls.col0(e.colour);
            pls.fill(4, sx, sy);
        } else if (e.what == legend_entry::kind::line) {
            pls.col0(e.colour);
            if (e.line) {
                pls.width(e.width);
                apply_dash(pls, e.dash);
                pls.join(pad, yc, pad + sample, yc);
                pls.lsty(1);
            }
            if (!e.marker.empty()) {
                std::vector<double> mx{pad + 0.5 * sample}, my{yc};
                draw_markers(pls, mx, my, e.marker.c_str());
            }
        }
        pls.col0(ci_ink);
        pls.schr(0, note_scale);
        pls.ptex(text_x, yc, 1.0, 0.0, 0.0, plplot_text(e.text).c_str());
        pls.schr(0, 1.0);
    }
    pls.vpor(vx0, vx1, vy0, vy1);
    pls.wind(wx0, wx1, wy0, wy1);
}

void draw_broken_line(plstream& pls, const std::vector<double>& x, const std::vector<double>& y) {
    std::vector<PLFLT> rx, ry;
    auto flush = [&] {
        if (rx.size() >= 2) pls.line(static_cast<PLINT>(rx.size()), rx.data(), ry.data());
        rx.clear();
        ry.clear();
    };
    for (std::size_t i = 0; i < x.size(); ++i) {
        if (std::isfinite(x[i]) && std::isfinite(y[i])) {
            rx.push_back(x[i]);
            ry.push_back(y[i]);
        } else {
            flush();
        }
    }
    flush();
}

void draw_markers(plstream& pls, const std::vector<double>& x, const std::vector<double>& y, const char* glyph) {
    std::vector<PLFLT> rx, ry;
    for (std::size_t i = 0; i < x.size(); ++i)
        if (std::isfinite(x[i]) && std::isfinite(y[i])) {
            rx.push_back(x[i]);
            ry.push_back(y[i]);
        }
    if (rx.empty()) return;
    pls.schr(0, marker_scale);
    pls.string(static_cast<PLINT>(rx.size()), rx.data(), ry.data(), glyph);
    pls.schr(0, 1.0);
}

void validate_axis(const axis& a, const std::string& name, const location& where) {
    auto bad = [&](const std::string& what) { throw_input(where, name + ": " + what); };
    if (a.min && !std::isfinite(*a.min)) bad("min is not a finite number");
    if (a.max && !std::isfinite(*a.max)) bad("max is not a finite number");
    if (a.scale == axis_scale::log10) {
        if (a.min && *a.min <= 0) bad("min must be > 0 on a log axis");
        if (a.max && *a.max <= 0) bad("max must be > 0 on a log axis");
    }
    if (a.min && a.max && !(*a.max > *a.min)) bad("max must be greater than min");
}

}  // namespace tipgap::plot::detail
