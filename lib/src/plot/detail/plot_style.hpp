#pragma once
// tipgap's plot style in one place: colours, line looks, sizes, and the PLplot colour indices they
// occupy. Internal; tests include it to check that looks stay distinct in grey.
#include <array>
#include <string>
#include <string_view>

#include "tipgap/plot/plot.hpp"

class plstream;

namespace tipgap::plot::detail {

// A dash pattern: marks and spaces in micrometres on the page (PLplot's plstyl units); no marks
// is a solid line. PLplot's built-in styles are about 1 mm long, too fine to tell apart at a
// glance, hence our own, several millimetres long.
struct dash_pattern {
    int count = 0;
    std::array<int, 3> mark{};
    std::array<int, 3> space{};
    bool operator==(const dash_pattern&) const = default;
};

// One entry of the series cycle: everything that tells two series apart, so that each pair differs
// in colour lightness, dash pattern and marker shape at once.
struct look {
    rgb colour;
    dash_pattern dash;
    const char* marker;     // UTF-8 glyph drawn with plstring, centred on the point
};

inline constexpr std::size_t look_count = 6;
const look& look_at(int index);  // index ≥ 0, wraps around

// Fixed colours (sRGB).
inline constexpr rgb background{255, 255, 255};
inline constexpr rgb ink{34, 34, 38};             // text, axes, frame
inline constexpr rgb grid_colour{222, 222, 226};
inline constexpr rgb reference_colour{88, 88, 92};
inline constexpr rgb no_value_colour{196, 196, 196};
inline constexpr rgb no_value_hatch{128, 128, 128};
inline constexpr rgb bar_fill{150, 172, 196};
inline constexpr rgb bar_edge{52, 70, 96};
inline constexpr rgb legend_frame{178, 178, 184};
// A grey band: fill lighter than every tint (grey level 232 against about 212), edges darker than
// the grid, so the band and a tinted band inside it stay apart in colour and in grey.
inline constexpr rgb band_grey{232, 232, 236};
inline constexpr rgb band_edge{140, 140, 146};

// cmap0 slots.
enum colour_index : int {
    ci_background = 0,
    ci_ink = 1,
    ci_grid = 2,
    ci_reference = 3,
    ci_no_value = 4,
    ci_no_value_hatch = 5,
    ci_bar_fill = 6,
    ci_bar_edge = 7,
    ci_legend_frame = 8,
    ci_band_grey = 9,
    ci_band_edge = 10,
    ci_look = 11,                                 // ci_look + i: colour of look i
    ci_tint = ci_look + static_cast<int>(look_count),  // ci_tint + i: band tint of look i
    ci_count = ci_tint + static_cast<int>(look_count),
};

// A band's tint: the look colour mixed with white so bands never hide the series drawn over them.
rgb tint(rgb c);

// Dash patterns of reference lines, one per line in order (wrapping); none of them solid.
dash_pattern reference_dash(int index);

// Makes `d` the current line style.
void apply_dash(::plstream& pls, const dash_pattern& d);

// Sizes, relative to the page-independent PLplot defaults.
inline constexpr double text_height_mm = 4.2;     // labels and tick numbers
inline constexpr double title_scale = 1.15;       // panel titles
inline constexpr double note_scale = 0.85;        // annotations, legend text
inline constexpr double marker_scale = 0.8;       // marker glyphs
inline constexpr double series_width = 2.0;       // line widths (PLplot width units)
inline constexpr double reference_width = 1.5;
inline constexpr double frame_width = 1.0;

// The palette's lightness ends (OKLab L, Ottosson 2020): dark enough for contrast with white
// paper, light enough that the top end is not mistaken for the background.
inline constexpr double palette_dark_L = 0.24;
inline constexpr double palette_light_L = 0.93;

// Plain text to PLplot text: PLplot treats '#' as an escape character, so it is doubled.
std::string plplot_text(std::string_view text);

}  // namespace tipgap::plot::detail
