#pragma once
// Internals shared by the panel drawers: where a panel goes, axis ranges, frames and legends.
#include <plplot/plstream.h>

#include <string>
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

// Light grid, then (after the data) the frame with ticks, numbers, labels and the title.
void draw_grid(plstream& pls, const axis& x, const axis& y);
void draw_frame(plstream& pls, const std::string& title, const axis& x, const axis& y);

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
// Draws the legend inside the current viewport's corner `where`; the viewport and window are
// restored afterwards. PLplot cannot measure text, so the box width is estimated from the longest
// entry (0.7 text heights a character, generous for the sans face used).
void draw_legend(plstream& pls, const std::vector<legend_entry>& entries, legend_position where, const cell& c);

// Draws a polyline through finite points, broken at non-finite ones.
void draw_broken_line(plstream& pls, const std::vector<double>& x, const std::vector<double>& y);
// Draws a glyph at every finite point.
void draw_markers(plstream& pls, const std::vector<double>& x, const std::vector<double>& y, const char* glyph);

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
