#pragma once
// Figures for every command: x–y plots, colour maps and histograms, written as PNG, SVG or PDF
// (chosen by the file extension) through PLplot. Plain vectors and strings in, a file out: no
// physics here. Text is plain UTF-8 (Greek letters, "⁻¹", "±" are fine); there is no markup.
#include <cstddef>
#include <optional>
#include <string>
#include <variant>
#include <vector>

namespace tipgap::plot {

enum class file_format { png, svg, pdf };

// The format for `path` by its extension (case-insensitive): .png, .svg or .pdf.
// path: any file name. Throws tipgap::error (input) naming the file and the accepted extensions.
file_format format_from_path(const std::string& path);

enum class axis_scale { linear, log10 };

struct axis {
    std::string label;                      // with units in brackets, e.g. "gap [nm]"
    axis_scale scale = axis_scale::linear;  // log10: data ≤ 0 is left out (a gap in lines)
    std::optional<double> min;              // data units; default: from the data (log10: > 0)
    std::optional<double> max;              // data units; default: from the data; > min
};

enum class draw_style { line, markers, line_and_markers };

// A "look" is one entry of the figure's cycle of colour + dash pattern + marker; consecutive
// looks differ in all three, so series stay distinct when printed in grey.
inline constexpr int next_look = -1;

struct series {
    std::vector<double> x;                  // data units; non-finite points are gaps
    std::vector<double> y;                  // same length as x
    std::string label;                      // legend entry; empty: not in the legend
    draw_style style = draw_style::line;
    int look = next_look;                   // 0.. picks a look; next_look takes the next unused one
};

// How a band is filled: a light tint of its look's colour, or neutral light grey with darker grey
// edges (stays distinct from every tint and from white in a grey print, e.g. a wide prediction band
// around a narrow confidence band).
enum class band_fill { tint, grey };

// A shaded region between two curves, e.g. a fit's confidence band. Drawn beneath the series.
struct band {
    std::vector<double> x;                  // data units, same length as y_low and y_high
    std::vector<double> y_low;              // lower edge
    std::vector<double> y_high;             // upper edge
    std::string label;                      // legend entry; empty: none
    int look = 0;                           // tint of this look's colour (use the fitted series' look)
    band_fill fill = band_fill::tint;
};

enum class orientation { horizontal, vertical };

// A straight line across the panel at a fixed value (a noise floor, a contact distance, a mean).
// Reference lines are dark grey, each with its own dash pattern.
struct reference_line {
    orientation direction = orientation::horizontal;
    double value = 0.0;                     // data units on the axis it crosses
    std::string label;                      // legend entry; empty: none
};

// Text placed at a data position.
struct annotation {
    double x = 0.0;                         // data units
    double y = 0.0;                         // data units
    std::string text;
    double justification = 0.0;             // 0: text starts at x, 0.5: centred, 1: ends at x
};

// best: the corner whose legend box covers the fewest drawn points (series, bands, reference lines);
// when every corner covers some, the y range is raised so that the legend sits above the data.
enum class legend_position { best, top_right, top_left, bottom_right, bottom_left, none };

struct xy_panel {
    std::string title;
    axis x_axis;
    axis y_axis;
    std::vector<series> lines;
    std::vector<band> bands;
    std::vector<reference_line> references;
    std::vector<annotation> notes;
    legend_position legend = legend_position::best;
};

// A matrix shown as coloured cells with a colour bar. The palette is tipgap's own: lightness rises
// monotonically from dark to light, so it stays readable in grey. Cells without a value (NaN) are
// drawn in neutral grey with a hatch, which no palette colour looks like.
struct colour_map_panel {
    std::string title;
    axis x_axis;                            // label used; scale must be linear; min/max crop the view
    axis y_axis;                            // likewise
    std::vector<double> x;                  // nx cell-centre coordinates, strictly ascending, nx ≥ 1
    std::vector<double> y;                  // ny cell-centre coordinates, strictly ascending, ny ≥ 1
    std::vector<double> z;                  // row-major, z[iy * nx + ix]; NaN: no value
    std::string colour_bar_label;           // with units, e.g. "apparent barrier [eV]"
    std::optional<double> z_min;            // colour range; default: finite data range;
    std::optional<double> z_max;            //   values outside are drawn in the end colours
    bool equal_aspect = false;              // true: one x unit as long as one y unit (maps in nm)
};

// Counts of values in bins, drawn as bars.
struct histogram_panel {
    std::string title;
    axis x_axis;                            // label of the values; scale must be linear
    std::string y_label = "count";
    std::vector<double> values;             // non-finite values are left out (and counted)
    int bins = 0;                           // 0..10000; 0: automatic (Freedman–Diaconis); unused with edges
    std::vector<double> edges;              // optional bin edges, strictly ascending, ≥ 2 values
    std::vector<reference_line> markers;    // vertical lines, e.g. mean and median
    legend_position legend = legend_position::top_right;
};

using panel = std::variant<xy_panel, colour_map_panel, histogram_panel>;

struct figure {
    std::string title;                      // over all panels; empty: none
    std::vector<panel> panels;              // at least one; filled in rows, left to right
    int columns = 1;                        // 1..panels.size(); 1 stacks the panels
    int panel_width = 800;                  // one panel: pixels (PNG) or points (SVG, PDF); 200..4000
    int panel_height = 560;                 // likewise
};

// Writes `fig` to `path` in the format of its extension. The file appears whole or not at all:
// PLplot writes a temporary sibling that is renamed onto `path` only on success.
// path: target file, its directory must exist and be writable.
// Throws tipgap::error (input) for a bad extension, inconsistent data (named by panel and item)
// or an unwritable file; nothing is left behind then and an old file at `path` is kept.
void write_figure(const figure& fig, const std::string& path);

// The bins a histogram panel draws.
struct histogram_bins {
    std::vector<double> edges;              // counts.size() + 1 values, ascending
    std::vector<std::size_t> counts;        // values in [edges[i], edges[i+1]); the last bin is closed
    std::size_t left_out = 0;               // non-finite values and values outside the edges
};

// Bins `values`. bins: 0..10000 (0: automatic, Freedman & Diaconis 1981, bin width 2·IQR·n^(-1/3));
// edges: empty, or ≥ 2 strictly ascending values (then `bins` is unused).
// Throws tipgap::error (input) for bad edges or a bin count outside 0..10000.
histogram_bins make_histogram(const std::vector<double>& values, int bins, const std::vector<double>& edges = {});

struct rgb {
    unsigned char r = 0, g = 0, b = 0;      // sRGB, 0..255
};

// The colour-map palette at fraction t ∈ [0, 1] (clamped): dark at 0, light at 1.
rgb palette_colour(double t);

}  // namespace tipgap::plot
