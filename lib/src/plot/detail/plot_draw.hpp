#pragma once
// Internals shared by the panel drawers: where a panel goes, axis ranges, frames and legends.
#include <plplot/plstream.h>

#include <string>
#include <utility>
#include <vector>

#include "tipgap/core/error.hpp"
#include "tipgap/plot/plot.hpp"
#include "plot/detail/plot_style.hpp"

namespace tipgap::plot::detail {

// A panel's cell on the page, in normalised page coordinates (0..1, y up), plus the page size so
// margins can be given in millimetres and stay the same for any panel size.
struct cell {
    double x0 = 0, x1 = 1, y0 = 0, y1 = 1;
    double page_width_mm = 0, page_height_mm = 0;
};

// Margins around a panel's plot area in units of the text height.
struct margins {
    double left = 7.5, right = 2.0, bottom = 4.2, top = 3.6;
};

// Sets the viewport for `c` less `m` and returns nothing; the caller then sets the window.
void set_viewport(plstream& pls, const cell& c, const margins& m);

// An axis range in plot coordinates (log10 of the data on a log axis).
struct range {
    double lo = 0, hi = 1;
};

// Plot coordinate of a data value: log10(v) on a log axis; NaN when v cannot be shown.
double to_plot(double v, axis_scale s);

// Range of finite plot coordinates collected by the caller, widened for display: linear axes get
// 4 % padding, log axes are widened outward to whole decades (so decade ticks are labelled);
// explicit min/max in `a` take precedence. A degenerate range is opened around its value.
range display_range(const std::vector<double>& plot_values, const axis& a);

// Light grid, then (after the data) the frame with ticks, numbers, labels and the title. Both read
// the current window: log axes spanning more than max_minor_decades decades get no minor ticks,
// and linear axes are numbered in plain decimals (never PLplot's "(x10ⁿ)" scale label).
inline constexpr double max_minor_decades = 3.0;
void draw_grid(plstream& pls, const axis& x, const axis& y);
void draw_frame(plstream& pls, const std::string& title, const axis& x, const axis& y);

// The PLplot box options of an axis spanning `span` plot units (decades on a log axis); y: the
// vertical axis. Exposed for tests.
std::string box_options(const axis& a, double span, bool y);

// The tick step of a linear axis spanning `span` plot units: 1, 2 or 5 times a power of ten, four
// to eight ticks; 0 for an empty or non-finite span.
double tick_step(double span);

// A plain-decimal tick label for `value` on a linear axis spanning `span`: the decimals of the
// tick step, no exponent, no "-0".
std::string tick_label(double value, double span);

// One legend entry: a line sample (with or without a marker), a filled box, or text alone.
struct legend_entry {
    enum class kind { line, box, text } what = kind::line;
    std::string text;
    int colour = 1;         // cmap0 index of the line, marker or box
    bool line = true;       // kind::line: draw the line sample
    dash_pattern dash;      // kind::line
    double width = series_width;
    std::string marker;     // empty: none
};
// The legend box in millimetres on the page for text of height text_height_mm.
struct legend_box {
    double width_mm = 0, height_mm = 0, inset_mm = 0;
};
legend_box legend_size(const std::vector<legend_entry>& entries, double text_height_mm);

// Where a legend goes: the corner, and the top of the y range (plot coordinates) that makes room.
struct legend_placement {
    legend_position corner = legend_position::top_right;
    double y_hi = 1;
};
// Places a legend of box_w x box_h (fractions of the plot area, inset included) for `requested`:
// an explicit corner is kept; `best` takes the corner covering the fewest of `points` (plot
// coordinates, preference top right, top left, bottom right, bottom left on ties), and when each
// corner covers at least one, raises y.hi until a top corner is clear of every point.
legend_placement place_legend(const std::vector<std::pair<double, double>>& points, const range& x, const range& y,
                              double box_w, double box_h, legend_position requested);

// Draws the legend inside the current viewport's corner `where` (not `best`); the viewport and
// window are restored afterwards. PLplot cannot measure text, so the box width is estimated from the longest
// entry (0.7 text heights a character, generous for the sans face used).
void draw_legend(plstream& pls, const std::vector<legend_entry>& entries, legend_position where, const cell& c);

// Draws a polyline through finite points, broken at non-finite ones.
void draw_broken_line(plstream& pls, const std::vector<double>& x, const std::vector<double>& y);
// Draws a glyph at every finite point.
void draw_markers(plstream& pls, const std::vector<double>& x, const std::vector<double>& y, const char* glyph);

// An x–y panel's ranges, looks, legend and legend corner, as draw_xy uses them; the plot area is
// plot_width_mm x plot_height_mm with text text_height_mm high. Exposed for tests.
struct xy_layout {
    range x, y;                          // plot coordinates (log10 of the data on a log axis)
    std::vector<int> looks;              // per series
    std::vector<legend_entry> legend;
    legend_position corner = legend_position::top_right;
};
xy_layout layout_xy(const xy_panel& p, double plot_width_mm, double plot_height_mm, double text_height_mm);

// Panel drawers (each validates nothing: write_figure has done that).
void draw_xy(plstream& pls, const xy_panel& p, const cell& c);
void draw_colour_map(plstream& pls, const colour_map_panel& p, const cell& c);
void draw_histogram(plstream& pls, const histogram_panel& p, const cell& c);

// Validation, with `where` naming the output file and the panel ("panel 2").
void validate_xy(const xy_panel& p, const location& where);
void validate_colour_map(const colour_map_panel& p, const location& where);
void validate_histogram(const histogram_panel& p, const location& where);
void validate_axis(const axis& a, const std::string& name, const location& where);

}  // namespace tipgap::plot::detail
