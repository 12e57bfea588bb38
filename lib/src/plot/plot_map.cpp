// The colour-map panel: cells coloured by value, NaN cells hatched grey, a colour bar.
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <fmt/format.h>
#include <limits>

#include "plot/detail/plot_draw.hpp"
#include "plot/detail/plot_style.hpp"

namespace tipgap::plot::detail {

namespace {

// Cell edges from cell centres: midway between neighbours, half a spacing beyond the ends.
std::vector<PLFLT> cell_edges(const std::vector<double>& centres) {
    const std::size_t n = centres.size();
    std::vector<PLFLT> e(n + 1);
    if (n == 1) {
        const double half = centres[0] == 0.0 ? 0.5 : 0.05 * std::abs(centres[0]);
        e[0] = centres[0] - half;
        e[1] = centres[0] + half;
        return e;
    }
    for (std::size_t i = 1; i < n; ++i) e[i] = 0.5 * (centres[i - 1] + centres[i]);
    e[0] = centres[0] - 0.5 * (centres[1] - centres[0]);
    e[n] = centres[n - 1] + 0.5 * (centres[n - 1] - centres[n - 2]);
    return e;
}

bool strictly_ascending(const std::vector<double>& v) {
    for (std::size_t i = 0; i < v.size(); ++i)
        if (!std::isfinite(v[i]) || (i > 0 && !(v[i] > v[i - 1]))) return false;
    return true;
}

// Grey fill with a 45° hatch over a world-coordinate rectangle.
void draw_no_value_swatch(plstream& pls, double x0, double x1, double y0, double y1) {
    PLFLT bx[4] = {x0, x1, x1, x0};
    PLFLT by[4] = {y0, y0, y1, y1};
    pls.col0(ci_no_value);
    pls.psty(0);
    pls.fill(4, bx, by);
    const PLINT angle[1] = {450};     // tenths of a degree
    const PLINT spacing[1] = {1800};  // micrometres
    pls.col0(ci_no_value_hatch);
    pls.width(0.8);
    pls.pat(1, angle, spacing);
    pls.fill(4, bx, by);
    pls.psty(0);
}

}  // namespace

void validate_colour_map(const colour_map_panel& p, const location& where) {
    validate_axis(p.x_axis, "x axis", where);
    validate_axis(p.y_axis, "y axis", where);
    if (p.x_axis.scale != axis_scale::linear || p.y_axis.scale != axis_scale::linear)
        throw_input(where, "colour map: x and y axes must be linear");
    if (p.x.empty() || p.y.empty()) throw_input(where, "colour map: x and y need at least one coordinate each");
    if (!strictly_ascending(p.x)) throw_input(where, "colour map: x must be finite and strictly ascending");
    if (!strictly_ascending(p.y)) throw_input(where, "colour map: y must be finite and strictly ascending");
    if (p.z.size() != p.x.size() * p.y.size())
        throw_input(where, fmt::format("colour map: z has {} values; expected {} (ny = {} rows of nx = {})", p.z.size(),
                                       p.x.size() * p.y.size(), p.y.size(), p.x.size()));
    for (double v : p.z)
        if (std::isinf(v)) throw_input(where, "colour map: z holds an infinite value; use NaN for cells without one");
    if ((p.z_min && !std::isfinite(*p.z_min)) || (p.z_max && !std::isfinite(*p.z_max)))
        throw_input(where, "colour map: z_min and z_max must be finite");
    if (p.z_min && p.z_max && !(*p.z_max > *p.z_min)) throw_input(where, "colour map: z_max must be greater than z_min");
}

namespace {

// Colour range: explicit, else the finite data; a flat map gets a unit-wide range around it.
// Counts the cells without a value in `missing`.
range colour_range(const colour_map_panel& p, std::size_t& missing) {
    double lo = std::numeric_limits<double>::infinity(), hi = -lo;
    missing = 0;
    for (double v : p.z) {
        if (std::isnan(v)) {
            ++missing;
            continue;
        }
        lo = std::min(lo, v);
        hi = std::max(hi, v);
    }
    if (p.z_min) lo = *p.z_min;
    if (p.z_max) hi = *p.z_max;
    if (!std::isfinite(lo) && !std::isfinite(hi)) lo = 0, hi = 1;
    else if (!std::isfinite(lo)) lo = hi - 1;
    else if (!std::isfinite(hi)) hi = lo + 1;
    if (hi == lo) {
        const double half = lo == 0.0 ? 0.5 : 0.05 * std::abs(lo);
        lo -= half;
        hi += half;
    }
    return {lo, hi};
}

// The cells, coloured over [z.lo, z.hi] on top of the hatched no-value background. PLplot wants
// data[ix][iy]; cells outside [zmin, zmax] are not drawn, which is how NaN cells let the
// background show: they become -inf, below any zmin.
void draw_cells(plstream& pls, const colour_map_panel& p, std::vector<PLFLT>& xe, std::vector<PLFLT>& ye,
                const range& z) {
    const std::size_t nx = p.x.size(), ny = p.y.size();
    // Background for cells without a value: neutral grey with a diagonal hatch, so that even in a
    // grey print it matches no palette colour.
    draw_no_value_swatch(pls, xe.front(), xe.back(), ye.front(), ye.back());
    std::vector<PLFLT> data(nx * ny);
    std::vector<const PLFLT*> columns(nx);
    for (std::size_t ix = 0; ix < nx; ++ix) {
        for (std::size_t iy = 0; iy < ny; ++iy) {
            const double v = p.z[iy * nx + ix];
            data[ix * ny + iy] = std::isnan(v) ? -std::numeric_limits<double>::infinity() : v;
        }
        columns[ix] = &data[ix * ny];
    }
    PLcGrid grid{xe.data(), ye.data(), nullptr, static_cast<PLINT>(nx + 1), static_cast<PLINT>(ny + 1), 0};
    const double big = std::numeric_limits<double>::max();
    pls.imagefr(columns.data(), static_cast<PLINT>(nx), static_cast<PLINT>(ny), 0, static_cast<PLFLT>(nx), 0,
                static_cast<PLFLT>(ny), -big, big, z.lo, z.hi, plcallback::tr1, &grid);
}

// Colour bar to the right of the plot area, full height, from z.lo to z.hi.
void draw_colour_bar(plstream& pls, const std::string& bar_label, const range& z) {
    PLFLT w = 0, h = 0;
    PLINT label_opts[1] = {PL_COLORBAR_LABEL_RIGHT};
    const std::string label = plplot_text(bar_label);
    const char* labels[1] = {label.c_str()};
    // 'o': plain-decimal labels from tick_label, never PLplot's "(x10ⁿ)" above the bar.
    const char* axis_opts[1] = {"bcmstvo"};
    PLFLT ticks[1] = {0.0};
    PLINT sub_ticks[1] = {0};
    PLFLT values[2] = {z.lo, z.hi};
    const PLFLT* value_rows[1] = {values};
    PLINT n_values[1] = {2};
    pls.col0(ci_ink);
    pls.width(frame_width);
    double span = z.hi - z.lo;
    pls.slabelfunc(
        [](PLINT, PLFLT value, char* label, PLINT length, PLPointer data) {
            std::snprintf(label, static_cast<std::size_t>(length), "%s", tick_label(value, *static_cast<double*>(data)).c_str());
        },
        &span);
    pls.colorbar(&w, &h, PL_COLORBAR_IMAGE | PL_COLORBAR_LABEL_RIGHT,
                 PL_POSITION_RIGHT | PL_POSITION_OUTSIDE | PL_POSITION_VIEWPORT, 0.025, 0.0, 0.035, 1.0,
                 ci_background, ci_ink, 1, 0.0, 1.0, ci_ink, 1.0, 1, label_opts, labels, 1, axis_opts, ticks,
                 sub_ticks, n_values, value_rows);
    pls.slabelfunc(nullptr, nullptr);
}

// A key for the hatch: a swatch at the top right, above the plot area, with its text to the left
// of it (PLplot cannot measure text, so the text is right-aligned against the swatch rather than
// the swatch placed after the text).
void draw_no_value_key(plstream& pls, const cell& c, std::size_t missing, std::size_t cells) {
    PLFLT vx0, vx1, vy0, vy1;
    pls.gvpd(vx0, vx1, vy0, vy1);
    PLFLT def_mm = 0, height_mm = 0;
    pls.gchr(def_mm, height_mm);
    const double sw = 1.6 * height_mm / c.page_width_mm, sh = 1.1 * height_mm / c.page_height_mm;
    const double y0 = vy1 + 0.45 * height_mm / c.page_height_mm;
    pls.vpor(vx1 - sw, vx1, y0, y0 + sh);
    pls.wind(0, 1, 0, 1);
    draw_no_value_swatch(pls, 0, 1, 0, 1);
    pls.col0(ci_ink);
    pls.schr(0, note_scale);
    pls.mtex("lv", 0.6, 0.5, 1.0, plplot_text(fmt::format("no value: {} of {} cells", missing, cells)).c_str());
    pls.schr(0, 1.0);
    pls.vpor(vx0, vx1, vy0, vy1);
}

}  // namespace

void draw_colour_map(plstream& pls, const colour_map_panel& p, const cell& c) {
    std::vector<PLFLT> xe = cell_edges(p.x), ye = cell_edges(p.y);
    std::size_t missing = 0;
    const range z = colour_range(p, missing);

    // Room on the right for the colour bar, its numbers and its label.
    margins m;
    m.right = 12.5;
    set_viewport(pls, c, m);
    const double wx0 = p.x_axis.min.value_or(xe.front()), wx1 = p.x_axis.max.value_or(xe.back());
    const double wy0 = p.y_axis.min.value_or(ye.front()), wy1 = p.y_axis.max.value_or(ye.back());
    if (p.equal_aspect) {
        PLFLT vx0, vx1, vy0, vy1;
        pls.gvpd(vx0, vx1, vy0, vy1);
        pls.vpas(vx0, vx1, vy0, vy1, (wy1 - wy0) / (wx1 - wx0));
    }
    pls.wind(wx0, wx1, wy0, wy1);

    draw_cells(pls, p, xe, ye, z);
    draw_frame(pls, p.title, p.x_axis, p.y_axis);
    draw_colour_bar(pls, p.colour_bar_label, z);
    if (missing > 0) draw_no_value_key(pls, c, missing, p.z.size());
}

}  // namespace tipgap::plot::detail
