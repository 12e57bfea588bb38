// tipgap's plot style: the colour-map palette, the series looks, text escaping.
#include <algorithm>
#include <cmath>
#include <numbers>

#include <plplot/plstream.h>

#include "plot/detail/plot_style.hpp"

namespace tipgap::plot {

namespace {

struct linear_rgb {
    double r, g, b;
};

// OKLab to linear sRGB, B. Ottosson, "A perceptual color space for image processing" (2020);
// matrix entries from memory, checked: L = 1, a = b = 0 maps to white within 1e-4.
linear_rgb oklab_to_linear(double L, double a, double b) {
    const double l_ = L + 0.3963377774 * a + 0.2158037573 * b;
    const double m_ = L - 0.1055613458 * a - 0.0638541728 * b;
    const double s_ = L - 0.0894841775 * a - 1.2914855480 * b;
    const double l = l_ * l_ * l_, m = m_ * m_ * m_, s = s_ * s_ * s_;
    return {+4.0767416621 * l - 3.3077115913 * m + 0.2309699292 * s,
            -1.2684380046 * l + 2.6097574011 * m - 0.3413193965 * s,
            -0.0041960863 * l - 0.7034186147 * m + 1.7076147010 * s};
}

bool in_gamut(const linear_rgb& c) {
    constexpr double eps = 1e-9;
    return c.r >= -eps && c.r <= 1 + eps && c.g >= -eps && c.g <= 1 + eps && c.b >= -eps && c.b <= 1 + eps;
}

// sRGB transfer function, IEC 61966-2-1.
unsigned char encode(double c) {
    c = std::clamp(c, 0.0, 1.0);
    const double v = c <= 0.0031308 ? 12.92 * c : 1.055 * std::pow(c, 1.0 / 2.4) - 0.055;
    return static_cast<unsigned char>(std::lround(v * 255.0));
}

}  // namespace

// tipgap's own palette: a path in OKLab whose lightness rises linearly (so grey prints keep the
// order) while the hue turns from a deep slate blue through teal and sage to a warm sand, with
// chroma highest in the middle where the eye separates hues best. Out-of-gamut points keep their
// lightness and hue and lose chroma (a safety net: the chroma below stays inside).
rgb palette_colour(double t) {
    if (!(t >= 0.0)) t = 0.0;  // NaN too
    t = std::min(t, 1.0);
    const double L = detail::palette_dark_L + (detail::palette_light_L - detail::palette_dark_L) * t;
    const double hue_deg = 262.0 - 182.0 * t;
    // Chroma kept inside the sRGB gamut along the whole path (the teal stretch is the narrowest),
    // so no clipping bends the ramp; a bump puts the most colour in the green-olive upper half.
    const double bump = std::exp(-std::pow((t - 0.72) / 0.18, 2));
    const double chroma = (0.068 + 0.05 * bump) * (1.0 - 0.35 * t * t * t * t);
    const double h = hue_deg * std::numbers::pi / 180.0;
    double lo = 0.0, hi = chroma;
    linear_rgb c = oklab_to_linear(L, hi * std::cos(h), hi * std::sin(h));
    if (!in_gamut(c)) {
        for (int i = 0; i < 40; ++i) {  // bisection on chroma: 40 halvings reach 1e-13
            const double mid = 0.5 * (lo + hi);
            if (in_gamut(oklab_to_linear(L, mid * std::cos(h), mid * std::sin(h)))) lo = mid; else hi = mid;
        }
        c = oklab_to_linear(L, lo * std::cos(h), lo * std::sin(h));
    }
    return {encode(c.r), encode(c.g), encode(c.b)};
}

namespace detail {

namespace {
// Colours chosen to spread over lightness (dark navy, mid vermilion, dark teal, light ochre, mid
// plum, mid-light olive), dash patterns all different, markers filled/open and of different shape.
constexpr dash_pattern solid{};
constexpr dash_pattern dashed{1, {3500, 0, 0}, {2000, 0, 0}};
constexpr dash_pattern dotted{1, {700, 0, 0}, {1500, 0, 0}};
constexpr dash_pattern dash_dot{2, {5000, 700, 0}, {1500, 1500, 0}};
constexpr dash_pattern long_dashed{1, {7000, 0, 0}, {2500, 0, 0}};
constexpr dash_pattern dash_dot_dot{3, {3500, 700, 700}, {1300, 1300, 1300}};
constexpr std::array<look, look_count> looks{{
    {{28, 48, 92}, solid, "●"},
    {{206, 84, 46}, dashed, "■"},
    {{12, 100, 98}, dotted, "▲"},
    {{222, 170, 58}, dash_dot, "◆"},
    {{136, 72, 142}, long_dashed, "○"},
    {{112, 142, 60}, dash_dot_dot, "□"},
}};
}  // namespace

const look& look_at(int index) {
    return looks[static_cast<std::size_t>(index < 0 ? 0 : index) % look_count];
}

rgb tint(rgb c) {
    // 28 % colour on white: clearly visible, yet light enough for lines and markers on top.
    constexpr double share = 0.28;
    auto mix = [](unsigned char v) {
        return static_cast<unsigned char>(std::lround(share * v + (1.0 - share) * 255.0));
    };
    return {mix(c.r), mix(c.g), mix(c.b)};
}

dash_pattern reference_dash(int index) {
    // Evenly broken lines unlike any look's: short even dashes, then fine dots, then long-short.
    static constexpr std::array<dash_pattern, 3> dashes{{
        {1, {2000, 0, 0}, {2000, 0, 0}},
        {1, {400, 0, 0}, {1200, 0, 0}},
        {2, {6000, 2000, 0}, {2000, 2000, 0}},
    }};
    return dashes[static_cast<std::size_t>(index < 0 ? 0 : index) % dashes.size()];
}

void apply_dash(plstream& pls, const dash_pattern& d) {
    if (d.count == 0) {
        pls.lsty(1);
        return;
    }
    pls.styl(d.count, d.mark.data(), d.space.data());
}

std::string plplot_text(std::string_view text) {
    std::string out;
    out.reserve(text.size());
    for (char c : text) {
        out += c;
        if (c == '#') out += '#';
    }
    return out;
}

}  // namespace detail
}  // namespace tipgap::plot
