// Grid reading, the lean per-pixel fit and barrier maps, on small synthetic grids written here
// (synthetic data: I = I0 exp(-2 κ z) + Gaussian noise, κ = sqrt(2 m φ)/ħ, Binnig et al., Appl.
// Phys. Lett. 40, 178 (1982); CODATA 2018 constants from tipgap/constants.hpp).
#include <gtest/gtest.h>

#include <atomic>
#include <charconv>
#include <functional>
#include <map>
#include <sstream>
#include <unistd.h>
#include <cmath>
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <random>
#include <string>
#include <vector>

#include "io/detail/csv_scan.hpp"
#include "tipgap/io/atomic_directory.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/fit/fit.hpp"
#include "tipgap/grid/grid.hpp"
#include "tipgap/grid/map.hpp"

namespace {

namespace fs = std::filesystem;
using namespace tipgap;

// κ for a barrier φ: the inverse of φ = ħ²κ²/2m.
double kappa_for(double phi_eV) { return std::sqrt(2.0 * si::electron_mass * phi_eV * si::electron_volt) / si::hbar; }

struct grid_spec {
    int nx = 16, ny = 16, points = 64;
    double background_eV = 4.0, disc_eV = 3.0;
    double disc_radius_px = 5.0;       // centred disc
    double z_range_nm = 0.4;
    double i0_pA = 1000.0, noise_pA = 0.5;
    unsigned seed = 11;
};

bool in_disc(const grid_spec& g, int ix, int iy) {
    const double cx = 0.5 * (g.nx - 1), cy = 0.5 * (g.ny - 1);
    return (ix - cx) * (ix - cx) + (iy - cy) * (iy - cy) <= g.disc_radius_px * g.disc_radius_px;
}
double truth_eV(const grid_spec& g, int ix, int iy) { return in_disc(g, ix, iy) ? g.disc_eV : g.background_eV; }

// One pixel's samples in pA at z_k = k * range / (points - 1) nm.
std::vector<double> pixel_current(const grid_spec& g, double phi_eV, std::mt19937_64& rng) {
    std::normal_distribution<double> noise(0.0, g.noise_pA);
    std::vector<double> i(static_cast<std::size_t>(g.points));
    const double two_kappa_per_nm = 2.0 * kappa_for(phi_eV) * 1e-9;
    for (int k = 0; k < g.points; ++k) {
        const double z = g.z_range_nm * k / (g.points - 1);
        i[static_cast<std::size_t>(k)] = g.i0_pA * std::exp(-two_kappa_per_nm * z) + noise(rng);
    }
    return i;
}

std::string pixel_rows(const grid_spec& g, int ix, int iy, const std::vector<double>& current) {
    std::string s;
    for (int k = 0; k < g.points; ++k)
        s += fmt::format("{},{},{:.6f},{:.6g}\n", ix, iy, g.z_range_nm * k / (g.points - 1), current[static_cast<std::size_t>(k)]);
    return s;
}

// Row-major grid text; `special` may replace pixels' currents.
std::string grid_text(const grid_spec& g,
                      const std::function<void(int, int, std::vector<double>&)>& special = nullptr) {
    std::mt19937_64 rng(g.seed);
    std::string s = "# synthetic grid (tests/grid_test.cpp)\n# bias: 100 mV\nx [nm],y [nm],z [nm],current [pA]\n";
    for (int iy = 0; iy < g.ny; ++iy) {
        for (int ix = 0; ix < g.nx; ++ix) {
            std::vector<double> c = pixel_current(g, truth_eV(g, ix, iy), rng);
            if (special) special(ix, iy, c);
            s += pixel_rows(g, ix, iy, c);
        }
    }
    return s;
}

class temp_dir {
public:
    temp_dir() {
        static int n = 0;
        path_ = fs::temp_directory_path() / fmt::format("tipgap_grid_test_{}_{}", ::getpid(), n++);
        fs::create_directories(path_);
    }
    ~temp_dir() {
        std::error_code ec;
        fs::remove_all(path_, ec);
    }
    std::string file(const std::string& name, const std::string& content = "") const {
        const std::string p = (path_ / name).string();
        if (!content.empty()) std::ofstream(p, std::ios::binary) << content;
        return p;
    }
    const fs::path& path() const { return path_; }

private:
    fs::path path_;
};

std::string error_of(const std::function<void()>& f) {
    try {
        f();
    } catch (const error& e) {
        return e.what();
    }
    return "(no error)";
}

map_options options_with(int threads, std::size_t chunk = std::size_t{1} << 20) {
    map_options o;
    o.read.threads = threads;
    o.read.chunk_bytes = chunk;
    return o;
}

// ---------------------------------------------------------------------------------------------
// Reference: std::from_chars (C++17, correctly rounded). The fast path must give the same bits.
TEST(grid_scan, fast_number_path_matches_from_chars_bit_for_bit) {
    std::vector<std::string> cases = {"0",      "-0",        "1",         "+1.5",     "0.1",      "0.30000000000000004",
                                      "123.456", "-0.000001", "9007199254740992", "9007199254740993",
                                      "12345678901234567890", "1e5", "1.5E-3", ".5", "5.", "0.0000000000000000000001",
                                      "1234567.1234567", "-999.999", "4.9406564584124654e-324", "1.7976931348623157e308"};
    std::mt19937_64 rng(3);
    for (int k = 0; k < 20000; ++k) {
        std::uniform_real_distribution<double> mag(-30.0, 30.0);
        const double v = std::pow(10.0, mag(rng)) * (k % 2 ? -1.0 : 1.0);
        const int digits = 1 + static_cast<int>(rng() % 17);
        cases.push_back(fmt::format("{:.{}f}", v, std::min(digits, 25)));
        cases.push_back(fmt::format("{:.{}g}", v, digits));
    }
    for (const std::string& s : cases) {
        double fast = 0.0, ref = 0.0;
        const char* end = s.data() + s.size();
        const char* p = detail::scan_number(s.data(), end, fast);
        const char* start = s[0] == '+' ? s.data() + 1 : s.data();
        const auto [q, ec] = std::from_chars(start, end, ref);
        ASSERT_EQ(ec, std::errc()) << s;
        ASSERT_NE(p, nullptr) << s;
        EXPECT_EQ(p, q) << s;
        EXPECT_EQ(std::signbit(fast), std::signbit(ref)) << s;
        EXPECT_EQ(fast, ref) << s;
    }
    double v = 0.0;
    const std::string bad[] = {"abc", "-", "nan", "inf", "1e999", "+-1", ""};
    for (const std::string& s : bad) EXPECT_EQ(detail::scan_number(s.data(), s.data() + s.size(), v), nullptr) << s;
}

// ---------------------------------------------------------------------------------------------
// fit_sweep_fast against fit_sweep (the SVD line fit) on noisy pixels, including descending z, a
// contact jump and a saturated top. Both solve the same weighted least-squares problem; 1e-12
// relative leaves room for the different rounding of an SVD and of centred sums (~1e-15 here).
constexpr double fast_vs_svd_rtol = 1e-12;

void expect_same(const fit_result& a, const fit_result& b) {
    auto near = [](double x, double y, const char* what) {
        EXPECT_NEAR(x, y, fast_vs_svd_rtol * std::max(std::abs(x), std::abs(y))) << what;
    };
    near(a.decay_constant_per_m, b.decay_constant_per_m, "kappa");
    near(a.decay_constant_stderr_per_m, b.decay_constant_stderr_per_m, "kappa stderr");
    near(a.apparent_barrier_J, b.apparent_barrier_J, "phi");
    near(a.apparent_barrier_stderr_J, b.apparent_barrier_stderr_J, "phi stderr");
    near(a.apparent_barrier_ci_low_J, b.apparent_barrier_ci_low_J, "phi ci low");
    near(a.apparent_barrier_ci_high_J, b.apparent_barrier_ci_high_J, "phi ci high");
    near(a.prefactor_A, b.prefactor_A, "prefactor");
    near(a.prefactor_stderr_A, b.prefactor_stderr_A, "prefactor stderr");
    near(a.r_squared, b.r_squared, "r2");
    near(a.residual_rms_ln, b.residual_rms_ln, "rms ln");
    near(a.residual_rms_A, b.residual_rms_A, "rms A");
    near(a.reduced_chi_square, b.reduced_chi_square, "chi2");
    near(a.current_decades_used, b.current_decades_used, "decades");
    EXPECT_EQ(a.t_quantile, b.t_quantile);
    EXPECT_EQ(a.points_used, b.points_used);
    EXPECT_EQ(a.points_total, b.points_total);
    EXPECT_EQ(a.points_below_floor, b.points_below_floor);
    EXPECT_EQ(a.points_saturated, b.points_saturated);
    EXPECT_EQ(a.noise_floor_A, b.noise_floor_A);
    EXPECT_EQ(a.current_noise_A, b.current_noise_A);
    EXPECT_EQ(a.saturation_A, b.saturation_A);
    EXPECT_EQ(a.z_ref_m, b.z_ref_m);
    EXPECT_EQ(a.contact.kind, b.contact.kind);
    EXPECT_EQ(a.contact.points_in_contact, b.contact.points_in_contact);
    EXPECT_EQ(a.saturation_detected, b.saturation_detected);
    near(a.line.slope, b.line.slope, "line slope");
}

TEST(grid_fit, fast_fit_agrees_with_fit_sweep_on_sample_pixels) {
    grid_spec g;
    g.points = 128;
    std::mt19937_64 rng(5);
    fit_workspace ws;
    fit_options o;
    o.calibration_uncertainty = 0.02;
    for (int k = 0; k < 40; ++k) {
        const double phi = 2.5 + 0.05 * k;
        std::vector<double> pA = pixel_current(g, phi, rng);
        curve_sweep s;
        for (int i = 0; i < g.points; ++i) {
            s.z_m.push_back(g.z_range_nm * i / (g.points - 1) * 1e-9);
            s.current_A.push_back(pA[static_cast<std::size_t>(i)] * 1e-12);
        }
        if (k % 4 == 1) {  // saturated: the amplifier clips at 400 pA, a flat top
            for (double& c : s.current_A) c = std::min(c, 400e-12);
        }
        if (k % 4 == 2) {  // jump to contact: the closest 4 points 30 times higher
            for (int i = 0; i < 4; ++i) s.current_A[static_cast<std::size_t>(i)] *= 30.0;
        }
        // Without a bias the contact test looks at the step alone (no conductance threshold).
        const double bias = k % 4 == 2 ? std::nan("") : 0.1;
        if (k % 4 == 3) {  // an approach sweep: z descending
            std::reverse(s.z_m.begin(), s.z_m.end());
            std::reverse(s.current_A.begin(), s.current_A.end());
        }
        const fit_result ref = fit_sweep(s, bias, o);
        fit_result fast;
        ASSERT_TRUE(fit_sweep_fast(s.z_m, s.current_A, bias, o, ws, fast));
        SCOPED_TRACE(fmt::format("pixel {}", k));
        expect_same(fast, ref);
        if (k % 4 == 1) EXPECT_GT(fast.points_saturated, 0u);
        if (k % 4 == 2) EXPECT_EQ(fast.contact.kind, contact_kind::jump);
    }
}

TEST(grid_fit, too_few_points_is_a_status_not_an_exception) {
    fit_workspace ws;
    fit_result r;
    const std::vector<double> z = {0.0, 1e-10, 2e-10, 3e-10, 4e-10, 5e-10, 6e-10, 7e-10, 8e-10, 9e-10};
    const std::vector<double> flat = {1e-13, -1e-13, 2e-13, 0.0, 1e-13, -2e-13, 1e-13, 0.0, -1e-13, 2e-13};
    EXPECT_FALSE(fit_sweep_fast(z, flat, 0.1, fit_options{}, ws, r));
    EXPECT_LT(r.points_used, 3u);
    EXPECT_EQ(classify_pixel(r, false, map_options{}), pixel_quality::too_few_points);
    EXPECT_THROW(fit_sweep(curve_sweep{sweep_direction::retract, z, flat, 0}, 0.1, fit_options{}), error);
}

// ---------------------------------------------------------------------------------------------
// The disc pattern is recovered. With Gaussian noise and honest standard errors, 99.7 % of the
// pixels would lie within 3σ; 95 % allows for the σ being estimated from each pixel's own
// residuals (Student t with ~40 degrees of freedom) and for the small bias of fitting ln|I|.
constexpr double within_three_sigma_fraction = 0.95;
// Region means: each pixel has σ_φ ≈ 0.01 eV, a region has ≥ 50 pixels, so the mean is known to
// ~0.002 eV; 0.01 eV also covers the bias of the log fit at the noise floor.
constexpr double region_mean_tolerance_eV = 0.01;

TEST(grid_map, disc_of_lower_barrier_is_recovered) {
    const grid_spec g;
    temp_dir d;
    const std::string path = d.file("disc.csv", grid_text(g));
    const barrier_map m = make_barrier_map(path, options_with(2));
    ASSERT_EQ(m.nx, 16u);
    ASSERT_EQ(m.ny, 16u);
    EXPECT_DOUBLE_EQ(m.pitch_x_m, 1e-9);
    EXPECT_DOUBLE_EQ(m.pitch_y_m, 1e-9);
    EXPECT_TRUE(m.uniform_pitch);
    EXPECT_EQ(m.grid.samples, 16u * 16u * 64u);
    EXPECT_EQ(m.grid.metadata.bias_V.value_or(0.0), 0.1);
    EXPECT_EQ(m.quality_counts[static_cast<int>(pixel_quality::ok)], 256u);
    std::size_t ok = 0, within = 0, n_disc = 0, n_bg = 0;
    double sum_disc = 0.0, sum_bg = 0.0;
    for (int iy = 0; iy < g.ny; ++iy) {
        for (int ix = 0; ix < g.nx; ++ix) {
            const std::size_t k = static_cast<std::size_t>(iy * g.nx + ix);
            if (m.quality[k] != pixel_quality::ok) continue;
            ++ok;
            const double phi = m.apparent_barrier_J[k] / si::electron_volt;
            const double se = m.apparent_barrier_stderr_J[k] / si::electron_volt;
            within += std::abs(phi - truth_eV(g, ix, iy)) <= 3.0 * se;
            (in_disc(g, ix, iy) ? sum_disc : sum_bg) += phi;
            ++(in_disc(g, ix, iy) ? n_disc : n_bg);
        }
    }
    EXPECT_GE(static_cast<double>(within), within_three_sigma_fraction * static_cast<double>(ok));
    ASSERT_GE(n_disc, 50u);
    EXPECT_NEAR(sum_disc / static_cast<double>(n_disc), g.disc_eV, region_mean_tolerance_eV);
    EXPECT_NEAR(sum_bg / static_cast<double>(n_bg), g.background_eV, region_mean_tolerance_eV);
    // The summary: the median lies on the majority (background), min and max near the two levels.
    EXPECT_NEAR(m.barrier.median / si::electron_volt, g.background_eV, 0.05);
    EXPECT_NEAR(m.barrier.min / si::electron_volt, g.disc_eV, 0.1);
    EXPECT_EQ(m.barrier.count, 256u);
}

TEST(grid_map, results_do_not_depend_on_threads_or_chunk_boundaries) {
    const grid_spec g;
    temp_dir d;
    const std::string path = d.file("g.csv", grid_text(g));
    const barrier_map ref = make_barrier_map(path, options_with(1));
    // 4096-byte chunks cut many pixels in two; 3 threads on 2 cores reorder the visits.
    for (auto [threads, chunk] : {std::pair{2, std::size_t{4096}}, std::pair{3, std::size_t{5000}}, std::pair{1, std::size_t{4096}}}) {
        const barrier_map m = make_barrier_map(path, options_with(threads, chunk));
        SCOPED_TRACE(fmt::format("threads {} chunk {}", threads, chunk));
        ASSERT_EQ(m.apparent_barrier_J.size(), ref.apparent_barrier_J.size());
        for (std::size_t k = 0; k < ref.apparent_barrier_J.size(); ++k) {
            EXPECT_EQ(m.apparent_barrier_J[k], ref.apparent_barrier_J[k]) << k;  // bit for bit
            EXPECT_EQ(m.apparent_barrier_stderr_J[k], ref.apparent_barrier_stderr_J[k]) << k;
            EXPECT_EQ(m.quality[k], ref.quality[k]) << k;
        }
        EXPECT_EQ(m.grid.samples, ref.grid.samples);
    }
}

TEST(grid_map, pixels_in_any_order_give_the_same_map) {
    const grid_spec g{4, 3, 32};
    temp_dir d;
    std::mt19937_64 rng(2);
    std::vector<std::string> blocks;
    for (int iy = 0; iy < g.ny; ++iy)
        for (int ix = 0; ix < g.nx; ++ix) blocks.push_back(pixel_rows(g, ix, iy, pixel_current(g, truth_eV(g, ix, iy), rng)));
    const std::string head = "x [nm],y [nm],z [nm],current [pA]\n";
    std::string forward = head, backward = head;
    for (const auto& b : blocks) forward += b;
    for (auto it = blocks.rbegin(); it != blocks.rend(); ++it) backward += *it;
    const barrier_map a = make_barrier_map(d.file("f.csv", forward), options_with(2));
    const barrier_map b = make_barrier_map(d.file("b.csv", backward), options_with(2));
    EXPECT_EQ(a.apparent_barrier_J, b.apparent_barrier_J);
    ASSERT_EQ(a.grid.x_m.size(), 4u);
    for (int k = 0; k < 4; ++k) EXPECT_DOUBLE_EQ(a.grid.x_m[static_cast<std::size_t>(k)], k * 1e-9);
}

TEST(grid_map, contact_and_saturation_get_their_codes) {
    const grid_spec g{6, 5, 64};
    temp_dir d;
    const std::string path = d.file("special.csv", grid_text(g, [](int ix, int iy, std::vector<double>& c) {
        if (ix == 1 && iy == 2) {
            for (double& v : c) v = std::min(v, 600.0);  // flat top: the amplifier clips at 600 pA
        }
        if (ix == 4 && iy == 3) {
            // Jump to contact: 2 µA at 100 mV is 0.26 G0, above the 0.1 G0 a jump must reach.
            for (int i = 0; i < 4; ++i) c[static_cast<std::size_t>(i)] = 2e6;
        }
        if (ix == 0 && iy == 0) {
            for (double& v : c) v = 0.3 * std::sin(v);  // nothing above the floor
        }
    }));
    const barrier_map m = make_barrier_map(path, options_with(2));
    EXPECT_EQ(m.quality[2 * 6 + 1], pixel_quality::saturated);
    EXPECT_EQ(m.quality[3 * 6 + 4], pixel_quality::contact);
    EXPECT_EQ(m.quality[0], pixel_quality::too_few_points);
    EXPECT_TRUE(std::isnan(m.apparent_barrier_J[0]));
    EXPECT_TRUE(std::isfinite(m.apparent_barrier_J[2 * 6 + 1]));  // fitted on the unclipped points
    EXPECT_EQ(m.quality_counts[static_cast<int>(pixel_quality::ok)], 27u);
    EXPECT_EQ(m.barrier.count, 29u);
}

TEST(grid_map, poor_fit_when_the_curve_is_not_one_exponential) {
    fit_result r;
    r.decay_constant_per_m = 1e10;
    r.apparent_barrier_J = 4.0 * si::electron_volt;
    r.apparent_barrier_stderr_J = 0.5 * si::electron_volt;  // 12.5 %
    r.current_decades_used = 3.0;
    const map_options o;
    EXPECT_EQ(classify_pixel(r, true, o), pixel_quality::poor_fit);
    r.apparent_barrier_stderr_J = 0.1 * si::electron_volt;
    EXPECT_EQ(classify_pixel(r, true, o), pixel_quality::ok);
    r.current_decades_used = 0.8;
    EXPECT_EQ(classify_pixel(r, true, o), pixel_quality::poor_fit);
    r.current_decades_used = 3.0;
    r.decay_constant_per_m = -1e10;
    EXPECT_EQ(classify_pixel(r, true, o), pixel_quality::poor_fit);
}

// ---------------------------------------------------------------------------------------------
// Damaged input: clear messages with file, line and column.
TEST(grid_read, truncated_and_unsorted_files_give_exact_errors) {
    const grid_spec g{3, 2, 8};
    temp_dir d;
    const std::string text = grid_text(g);  // 3 header lines, then 48 rows: lines 4..51
    auto run = [&](const std::string& name, const std::string& content) {
        const std::string p = d.file(name, content);
        return error_of([&] { make_barrier_map(p, options_with(2)); });
    };
    // Cut in the middle of the last row: the row misses cells.
    const std::string cut_mid = text.substr(0, text.size() - 12);
    EXPECT_EQ(run("mid.csv", cut_mid), d.file("mid.csv") + ":51:1: the row has 3 cells; the header on line 3 has 4 columns");
    // Cut after a whole row of the last pixel.
    const std::size_t last_rows = text.size() - pixel_rows(g, 2, 1, std::vector<double>(8, 1.0)).size();
    (void)last_rows;
    std::string cut_row = text;
    for (int k = 0; k < 3; ++k) cut_row.erase(cut_row.rfind('\n', cut_row.size() - 2) + 1);
    EXPECT_EQ(run("row.csv", cut_row), d.file("row.csv") +
                                            ":44:1: pixel (x = 2 nm, y = 1 nm) has 5 samples; the first pixel (line "
                                            "4) has 8; every pixel needs the same number (is the file cut short?)");
    // Cut after a whole pixel.
    std::string cut_pixel = text;
    for (int k = 0; k < 8; ++k) cut_pixel.erase(cut_pixel.rfind('\n', cut_pixel.size() - 2) + 1);
    EXPECT_EQ(run("pixel.csv", cut_pixel), d.file("pixel.csv") +
                                               ": the pixels do not fill a grid: 5 pixels for 3 x values times 2 y "
                                               "values; pixel (x = 2 nm, y = 1 nm) is missing (is the file cut short?)");
    // Unsorted: the first row of pixel (1, 0) moved to the top, before pixel (0, 0), so that
    // pixel (1, 0) starts on line 4 and again on line 13.
    std::string unsorted = text;
    const std::size_t a = unsorted.find("\n1,0,") + 1;        // first row of pixel (1, 0)
    const std::size_t b = unsorted.find('\n', a) + 1;
    const std::string row = unsorted.substr(a, b - a);
    unsorted.erase(a, b - a);
    unsorted.insert(unsorted.find("\n0,0,") + 1, row);
    EXPECT_EQ(run("unsorted.csv", unsorted),
              d.file("unsorted.csv") + ":13:1: pixel (x = 1 nm, y = 0 nm) appears again (first at line 4); each pixel's "
                                       "rows must be together, with every pixel once (rows of different pixels "
                                       "interleaved, or a pixel repeated?)");
    // A bad cell.
    std::string bad = text;
    bad.replace(bad.find("\n0,1,") + 1 + 4, 1, "q");
    const std::size_t bad_line = 4 + 3 * 8;
    EXPECT_EQ(run("bad.csv", bad), d.file("bad.csv") + fmt::format(":{}:5: 'q.000000' in column 'z' is not a number; expected a plain number such as 0.25 (the unit goes in the header)", bad_line));
    // Missing columns and units.
    EXPECT_EQ(run("nocol.csv", "x [nm],z [nm],current [pA]\n0,0,1\n"),
              d.file("nocol.csv") + ":1:1: the header has no 'y [<length unit>]' column; expected a header such as 'x "
                                    "[nm],y [nm],z [nm],current [pA]'");
    EXPECT_EQ(run("nounit.csv", "x,y [nm],z [nm],current [pA]\n"),
              d.file("nounit.csv") + ":1:1: column 'x' has no unit; write it in brackets, e.g. 'x [nm]'");
    EXPECT_EQ(run("empty.csv", "x [nm],y [nm],z [nm],current [pA]\n# nothing\n"),
              d.file("empty.csv") + ": no data rows after the header; expected one row per sample such as "
                                    "'0,0,0.01,812.5' under 'x [nm],y [nm],z [nm],current [pA]'");
}

TEST(grid_read, streams_with_bounded_buffers_and_reports_progress) {
    const grid_spec g{8, 8, 64};
    temp_dir d;
    const std::string text = grid_text(g);
    const std::string path = d.file("p.csv", text);
    grid_read_options o;
    o.threads = 2;
    o.chunk_bytes = 4096;
    std::vector<std::uint64_t> seen;
    o.progress = [&](std::uint64_t done, std::uint64_t total) {
        EXPECT_EQ(total, text.size());
        seen.push_back(done);
    };
    std::atomic<std::size_t> pixels{0}, samples{0};
    const grid_layout l = read_grid(path, o, [&](const grid_pixel_view& p, unsigned slot) {
        EXPECT_LE(slot, 2u);
        ++pixels;
        samples += p.z_m.size();
        EXPECT_EQ(p.z_m.size(), 64u);
        EXPECT_EQ(p.bias_V, 0.1);
        EXPECT_GE(p.where.line, 4);
    });
    EXPECT_EQ(pixels.load(), 64u);
    EXPECT_EQ(samples.load(), 64u * 64u);
    EXPECT_GT(seen.size(), text.size() / 4096 - 1);  // one report per chunk
    EXPECT_TRUE(std::is_sorted(seen.begin(), seen.end()));
    EXPECT_EQ(seen.back(), text.size());
    EXPECT_TRUE(l.warnings.empty());
    // No line end at the end of the file: read, with a warning.
    o.progress = nullptr;
    const grid_layout cut = read_grid(d.file("nl.csv", text.substr(0, text.size() - 1)), o, [](const grid_pixel_view&, unsigned) {});
    ASSERT_EQ(cut.warnings.size(), 1u);
    EXPECT_EQ(cut.pixels, 64u);
}

TEST(grid_read, directory_of_curve_files_gives_the_same_map_as_one_csv) {
    const grid_spec g{3, 2, 32};
    temp_dir d;
    const std::string text = grid_text(g);
    const std::string csv = d.file("grid.csv", text);
    fs::create_directory(d.path() / "curves");
    // Split the long CSV into one file per pixel with x/y metadata.
    std::istringstream in(text);
    std::string line;
    std::map<std::string, std::string> files;
    int n = 0;
    while (std::getline(in, line)) {
        if (++n <= 3) continue;
        const std::size_t c1 = line.find(','), c2 = line.find(',', c1 + 1);
        const std::string x = line.substr(0, c1), y = line.substr(c1 + 1, c2 - c1 - 1);
        std::string& f = files[fmt::format("p_{}_{}.csv", x, y)];
        if (f.empty()) f = fmt::format("# bias: 100 mV\n# x: {} nm\n# y: {} nm\nz [nm],current [pA]\n", x, y);
        f += line.substr(c2 + 1) + "\n";
    }
    for (const auto& [name, content] : files) d.file("curves/" + name, content);
    const barrier_map a = make_barrier_map(csv, options_with(2));
    const barrier_map b = make_barrier_map((d.path() / "curves").string(), options_with(2));
    EXPECT_TRUE(b.grid.directory);
    EXPECT_EQ(a.apparent_barrier_J, b.apparent_barrier_J);
    EXPECT_EQ(a.grid.x_m, b.grid.x_m);
    // A file without a position.
    d.file("curves/zz.csv", "z [nm],current [pA]\n0,1000\n0.1,130\n0.2,17\n");
    EXPECT_EQ(error_of([&] { make_barrier_map((d.path() / "curves").string(), options_with(2)); }),
              d.file("curves/zz.csv") + ": x: no lateral position in the metadata; every file of a grid directory needs "
                                        "'# x: <length>' and '# y: <length>' lines, e.g. '# x: 1.5 nm'");
}

// ---------------------------------------------------------------------------------------------
TEST(atomic_directory, replaces_an_earlier_output_but_never_foreign_files) {
    temp_dir d;
    const std::string target = (d.path() / "out").string();
    {
        atomic_directory a(target, {"a.txt", "b.txt"});
        std::ofstream(a.file("a.txt")) << "first";
        EXPECT_FALSE(fs::exists(target));  // nothing visible before commit
        a.commit();
    }
    EXPECT_TRUE(fs::exists(fs::path(target) / "a.txt"));
    {
        atomic_directory a(target, {"a.txt", "b.txt"});
        std::ofstream(a.file("b.txt")) << "second";
        a.commit();
    }
    EXPECT_FALSE(fs::exists(fs::path(target) / "a.txt"));  // replaced whole
    EXPECT_TRUE(fs::exists(fs::path(target) / "b.txt"));
    {
        atomic_directory a(target, {"a.txt", "b.txt"});
        std::ofstream(a.file("a.txt")) << "abandoned";
    }  // not committed: the old output stays, no temporary is left
    EXPECT_TRUE(fs::exists(fs::path(target) / "b.txt"));
    std::size_t entries = 0;
    for (const auto& e : fs::directory_iterator(d.path())) entries += e.path().filename() != "out";
    EXPECT_EQ(entries, 0u);
    std::ofstream((fs::path(target) / "notes.txt").string()) << "mine";
    EXPECT_EQ(error_of([&] { atomic_directory a(target, {"a.txt", "b.txt"}); }),
              target + ": exists and holds 'notes.txt', which this command does not write; it replaces only an empty "
                       "directory or its own earlier output. Remove it or choose another directory");
}

}  // namespace
