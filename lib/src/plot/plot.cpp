// write_figure: format by extension, validation, page layout, one fresh PLplot stream per figure,
// and the atomic hand-over of the finished file.
#include "tipgap/plot/plot.hpp"

#include <plplot/plplot.h>
#include <plplot/plstream.h>

#include <algorithm>
#include <cctype>
#include <cstdio>
#include <fcntl.h>
#include <filesystem>
#include <fmt/format.h>
#include <memory>
#include <string_view>
#include <sys/stat.h>
#include <unistd.h>
#include <vector>

#include "plot/detail/plot_draw.hpp"
#include "plot/detail/png_encode.hpp"
#include "plot/detail/plot_style.hpp"
#include "tipgap/io/atomic_file.hpp"
#include "tipgap/io/output_path.hpp"
#include "tipgap/io/output_transaction.hpp"
#include "tipgap/core/interrupt.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap::plot {

file_format format_from_path(const std::string& path) {
    std::string ext = std::filesystem::path(path).extension().string();
    std::transform(ext.begin(), ext.end(), ext.begin(), [](unsigned char ch) { return static_cast<char>(std::tolower(ch)); });
    if (ext == ".png") return file_format::png;
    if (ext == ".svg") return file_format::svg;
    if (ext == ".pdf") return file_format::pdf;
    location where;
    where.file = path;
    if (ext.empty() || ext == ".") throw_input(where, "plot file has no extension; expected .png, .svg or .pdf");
    throw_input(where, fmt::format("unknown plot file extension '{}'; expected .png, .svg or .pdf",
                                   std::filesystem::path(path).extension().string()));
}

namespace {

// PLplot device per format. SVG uses PLplot's own "svg" driver: it writes real <text> elements
// (searchable, editable), while "svgcairo" turns every glyph into a path.
const char* device_for(file_format f) {
    switch (f) {
    case file_format::png: return "memcairo";  // rendered into memory, encoded by png_encode.cpp
    case file_format::svg: return "svg";
    case file_format::pdf: return "pdfcairo";
    }
    return "pngcairo";
}

// Without this check a missing driver makes PLplot list its devices and read a choice from stdin.
bool device_available(const char* name) {
    constexpr int capacity = 128;
    const char* menu[capacity] = {};
    const char* names[capacity] = {};
    const char** pmenu = menu;
    const char** pnames = names;
    int n = capacity;
    plgDevs(&pmenu, &pnames, &n);
    for (int i = 0; i < n; ++i)
        if (names[i] && std::string_view(names[i]) == name) return true;
    return false;
}

// PLplot ends the process on a fatal error unless the exit handler does not return; throwing
// from it unwinds through PLplot's C frames (built with unwind tables on Debian amd64), and the
// next figure gets a fresh stream.
int throw_on_plplot_exit(const char* message) {
    throw error(error_kind::input, fmt::format("plotting failed in PLplot: {}", message ? message : "unknown error"));
}

// Removes the temporary file unless the figure made it to its target.
struct temporary_file {
    std::string path;
    registered_temporary registration{path, false};
    bool keep = false;
    ~temporary_file() {
        if (!keep) std::remove(path.c_str());
    }
};

// PLplot reports some failures (an unwritable file, a driver problem) by printing to stderr and
// carrying on (plabort, plwarn); the abort handler keeps the first message so that it becomes one
// tipgap error instead.
std::string plplot_abort_message;
void keep_plplot_abort(const char* message) {
    if (plplot_abort_message.empty()) plplot_abort_message = message ? message : "unknown error";
}

// Whether the renderer finished the file: a PNG ends with its IEND chunk, a PDF with %%EOF, an
// SVG with </svg> (trailing white space allowed). A full disk leaves a file cut short.
bool looks_complete(const std::string& path, file_format format) {
    std::FILE* f = std::fopen(path.c_str(), "rb");
    if (!f) return false;
    char tail[64] = {};
    std::fseek(f, 0, SEEK_END);
    const long size = std::ftell(f);
    const long n = std::min<long>(size, static_cast<long>(sizeof tail));
    std::fseek(f, size - n, SEEK_SET);
    const std::size_t got = std::fread(tail, 1, static_cast<std::size_t>(n), f);
    std::fclose(f);
    std::string_view t(tail, got);
    while (!t.empty() && std::isspace(static_cast<unsigned char>(t.back()))) t.remove_suffix(1);
    auto ends = [&](std::string_view e) { return t.size() >= e.size() && t.substr(t.size() - e.size()) == e; };
    switch (format) {
    case file_format::png: return ends(std::string_view("IEND\xAE\x42\x60\x82", 8));
    case file_format::pdf: return ends("%%EOF");
    case file_format::svg: return ends("</svg>");
    }
    return false;
}

void validate(const figure& fig, const std::string& path) {
    location where;
    where.file = path;
    if (fig.panels.empty()) throw_input(where, "figure has no panels");
    if (fig.columns < 1 || static_cast<std::size_t>(fig.columns) > fig.panels.size())
        throw_input(where, fmt::format("figure columns is {}; expected 1 to {} (the number of panels)", fig.columns,
                                       fig.panels.size()));
    auto in_size_range = [](int v) { return v >= 200 && v <= 4000; };
    if (!in_size_range(fig.panel_width) || !in_size_range(fig.panel_height))
        throw_input(where, fmt::format("panel size {} x {}; expected 200 to 4000 in each direction", fig.panel_width,
                                       fig.panel_height));
    for (std::size_t i = 0; i < fig.panels.size(); ++i) {
        location w = where;
        w.key = fmt::format("panel {}", i + 1);
        std::visit(
            [&](const auto& p) {
                using T = std::decay_t<decltype(p)>;
                if constexpr (std::is_same_v<T, xy_panel>) detail::validate_xy(p, w);
                else if constexpr (std::is_same_v<T, colour_map_panel>) detail::validate_colour_map(p, w);
                else detail::validate_histogram(p, w);
            },
            fig.panels[i]);
    }
}

void set_colours(plstream& pls) {
    using namespace detail;
    std::vector<PLINT> r(ci_count), g(ci_count), b(ci_count);
    auto put = [&](int i, rgb c) {
        r[static_cast<std::size_t>(i)] = c.r;
        g[static_cast<std::size_t>(i)] = c.g;
        b[static_cast<std::size_t>(i)] = c.b;
    };
    put(ci_background, background);
    put(ci_ink, ink);
    put(ci_grid, grid_colour);
    put(ci_reference, reference_colour);
    put(ci_no_value, no_value_colour);
    put(ci_no_value_hatch, no_value_hatch);
    put(ci_bar_fill, bar_fill);
    put(ci_bar_edge, bar_edge);
    put(ci_legend_frame, legend_frame);
    put(ci_band_grey, band_grey);
    put(ci_band_edge, band_edge);
    for (int i = 0; i < static_cast<int>(look_count); ++i) {
        put(ci_look + i, look_at(i).colour);
        put(ci_tint + i, tint(look_at(i).colour));
    }
    pls.scmap0(r.data(), g.data(), b.data(), ci_count);

    constexpr int steps = 256;
    std::vector<PLINT> r1(steps), g1(steps), b1(steps);
    for (int i = 0; i < steps; ++i) {
        const rgb c = palette_colour(static_cast<double>(i) / (steps - 1));
        r1[static_cast<std::size_t>(i)] = c.r;
        g1[static_cast<std::size_t>(i)] = c.g;
        b1[static_cast<std::size_t>(i)] = c.b;
    }
    pls.scmap1n(steps);
    pls.scmap1(r1.data(), g1.data(), b1.data(), steps);
}

void render(const figure& fig, const std::string& file, file_format format) {
    const int columns = fig.columns;
    const int rows = static_cast<int>((fig.panels.size() + static_cast<std::size_t>(columns) - 1) / static_cast<std::size_t>(columns));
    const int title_band = fig.title.empty() ? 0 : 48;  // pixels / points above the panels
    const int width = columns * fig.panel_width, height = rows * fig.panel_height + title_band;

    // A fresh stream per figure: PLplot keeps per-stream state (colours, fonts, page), and the
    // stream's destructor closes the output file, so nothing carries over to the next figure.
    auto pls = std::make_unique<plstream>();
    pls->sdev(device_for(format));
    // PNG: cairo draws into `image` (the same rasteriser as PLplot's pngcairo device), and the file
    // is encoded here, which is several times faster than cairo's PNG writer (libpng's adaptive
    // filters at zlib's default level).
    std::vector<unsigned char> image;
    if (format == file_format::png) {
        image.resize(static_cast<std::size_t>(width) * static_cast<std::size_t>(height) * 3);
        for (std::size_t i = 0; i < image.size(); i += 3) {
            image[i] = detail::background.r;
            image[i + 1] = detail::background.g;
            image[i + 2] = detail::background.b;
        }
        pls->smem(width, height, image.data());
    } else {
        pls->sfnam(file.c_str());
    }
    pls->spage(0, 0, width, height, 0, 0);
    pls->spause(false);
    pls->scolbg(detail::background.r, detail::background.g, detail::background.b);
    set_colours(*pls);
    pls->init();
    pls->adv(0);
    pls->schr(detail::text_height_mm, 1.0);
    pls->sfont(PL_FCI_SANS, PL_FCI_UPRIGHT, PL_FCI_MEDIUM);

    PLFLT xmin_mm, xmax_mm, ymin_mm, ymax_mm;
    pls->gspa(xmin_mm, xmax_mm, ymin_mm, ymax_mm);
    const double page_w = xmax_mm - xmin_mm, page_h = ymax_mm - ymin_mm;
    const double top = 1.0 - static_cast<double>(title_band) / height;

    if (!fig.title.empty()) {
        pls->vpor(0.0, 1.0, top, 1.0);
        pls->wind(0, 1, 0, 1);
        pls->col0(detail::ci_ink);
        pls->schr(0, detail::title_scale * 1.1);
        pls->sfont(PL_FCI_SANS, PL_FCI_UPRIGHT, PL_FCI_BOLD);
        pls->ptex(0.5, 0.45, 1.0, 0.0, 0.5, detail::plplot_text(fig.title).c_str());
        pls->sfont(PL_FCI_SANS, PL_FCI_UPRIGHT, PL_FCI_MEDIUM);
        pls->schr(0, 1.0);
    }

    for (std::size_t i = 0; i < fig.panels.size(); ++i) {
        const int col = static_cast<int>(i) % columns, row = static_cast<int>(i) / columns;
        detail::cell c;
        c.x0 = static_cast<double>(col) / columns;
        c.x1 = static_cast<double>(col + 1) / columns;
        c.y1 = top - top * row / rows;
        c.y0 = top - top * (row + 1) / rows;
        c.page_width_mm = page_w;
        c.page_height_mm = page_h;
        std::visit(
            [&](const auto& p) {
                using T = std::decay_t<decltype(p)>;
                if constexpr (std::is_same_v<T, xy_panel>) detail::draw_xy(*pls, p, c);
                else if constexpr (std::is_same_v<T, colour_map_panel>) detail::draw_colour_map(*pls, p, c);
                else detail::draw_histogram(*pls, p, c);
            },
            fig.panels[i]);
    }
    pls.reset();  // plend1: the driver finishes and closes the file (memcairo: fills `image`)
    if (format == file_format::png) detail::write_png_rgb(file, image, width, height);
}

}  // namespace

void write_figure(const figure& fig, const std::string& path) {
    const file_format format = format_from_path(path);
    validate(fig, path);
    location where;
    where.file = path;
    const char* device = device_for(format);
    if (!device_available(device))
        throw_input(where, fmt::format("PLplot device '{}' is not installed (Debian package plplot-driver-cairo)", device));

    // Create the temporary ourselves: PLplot would otherwise report an unopenable file by asking
    // for another name on stdin, and O_EXCL makes sure we never write through someone else's file.
    const std::string target = output_target(path);
    remove_stale_temporaries(target);
    temporary_file tmp{temporary_sibling(target)};
    const int fd = ::open(tmp.path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0666);
    if (fd < 0) {
        tmp.keep = true;  // not ours: nothing to remove
        tmp.registration.release();
        throw_input(where, "cannot open for writing (does the directory exist and is it writable?)");
    }
    ::close(fd);

    plsexit(throw_on_plplot_exit);
    plsabort(keep_plplot_abort);
    plplot_abort_message.clear();
    try {
        render(fig, tmp.path, format);
    } catch (const error& e) {
        throw error(e.kind(), where, e.detail());
    }
    if (!plplot_abort_message.empty()) throw_input(where, fmt::format("plotting failed in PLplot: {}", plplot_abort_message));
    if (!looks_complete(tmp.path, format))
        throw_input(where, "the figure was not written completely (is the disk full?); nothing was written");
    const int rfd = ::open(tmp.path.c_str(), O_RDONLY | O_CLOEXEC);
    const bool synced = rfd >= 0 && ::fsync(rfd) == 0;
    if (rfd >= 0) ::close(rfd);
    if (!synced) throw_input(where, "cannot write the file (fsync failed); nothing was written");
    tmp.keep = true;
    finish_output({tmp.path, target, path, false});
}

}  // namespace tipgap::plot
