// Curves for the plan and predict figures. Model evaluations happen here; tipgap::plot only draws.
#include "tipgap/figures/figures.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>

#include "core/detail/parallel.hpp"
#include "figures/detail/current_unit.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/model/geometry.hpp"
#include "tipgap/plan/warnings.hpp"

namespace tipgap {
namespace {

constexpr double J_per_eV = si::electron_volt;

plot::axis ax(const std::string& label, plot::axis_scale scale = plot::axis_scale::linear) {
    plot::axis a;
    a.label = label;
    a.scale = scale;
    return a;
}

// A current unit that keeps the numbers of a linear axis between 0.1 and 1000.
std::pair<double, const char*> current_unit(double max_abs_A) {
    const auto u = figures_detail::current_unit(max_abs_A);
    return {u.per_A, u.name};
}

// "1 nA", "250 pA": a current with a prefix for labels.
std::string current_text(double A) {
    if (A != 0.0 && std::abs(A) < 0.9999999e-12) return fmt::format("{:g} fA", A * 1e15);  // floors
    auto [scale, unit] = current_unit(std::abs(A) * 1.0000001);
    if (std::abs(A) * scale >= 1000) return fmt::format("{:g} A", A);
    return fmt::format("{:g} {}", A * scale, unit);
}

// A log current axis starts at the floor when some current shown lies below it (points below are
// clipped at the frame); otherwise the data set the range.
// A series lying wholly below the floor says so in its legend entry, as it draws nothing.
void clip_at_floor(plot::xy_panel& p, double floor_A) {
    for (plot::series& s : p.lines) {
        bool below = false, above = false;
        for (double y : s.y) {
            below = below || (y > 0 && y < floor_A);
            above = above || y >= floor_A;
        }
        if (below) p.y_axis.min = floor_A;
        if (below && !above && !s.label.empty()) s.label += fmt::format(" (below {})", current_text(floor_A));
    }
}

std::vector<double> linspace(double a, double b, int n) {
    std::vector<double> v(static_cast<std::size_t>(n));
    for (int i = 0; i < n; ++i) v[static_cast<std::size_t>(i)] = a + (b - a) * i / (n - 1);
    return v;
}

struct gap_curve {
    std::vector<double> gap_nm, current_A, barrier_eV;
};

// |I(s)| and the apparent barrier from its slope, (hbar^2/8m)(d ln|I|/ds)^2, on a grid around s0.
gap_curve gap_dependence(const config& c, double bias_V, double lo_m, double hi_m, int threads) {
    const int n = 81;
    gap_curve g;
    const auto s = linspace(lo_m, hi_m, n);
    g.current_A.resize(s.size());
    detail::parallel_for(s.size(), threads, [&](std::size_t i) { g.current_A[i] = std::abs(total_current(c.model, c.geometry, s[i], bias_V)); });
    g.barrier_eV.assign(s.size(), std::numeric_limits<double>::quiet_NaN());
    const double coeff = si::hbar * si::hbar / (8.0 * si::electron_mass) / J_per_eV;
    for (std::size_t i = 0; i < s.size(); ++i) {
        g.gap_nm.push_back(s[i] * 1e9);
        // Central differences inside (a plot needs ~1e-3, the grid gives it); the two end points,
        // where only a first-order one-sided difference exists, are left out.
        if (i == 0 || i + 1 == s.size()) continue;
        if (g.current_A[i - 1] > 0 && g.current_A[i + 1] > 0) {
            const double slope = (std::log(g.current_A[i + 1]) - std::log(g.current_A[i - 1])) / (s[i + 1] - s[i - 1]);
            g.barrier_eV[i] = coeff * slope * slope;
        }
    }
    return g;
}

plot::xy_panel current_gap_panel(const std::string& title) {
    plot::xy_panel p;
    p.title = title;
    p.x_axis = ax("gap s [nm]");
    p.y_axis = ax("|current| [A]", plot::axis_scale::log10);
    return p;
}

plot::xy_panel barrier_gap_panel(const std::string& title) {
    plot::xy_panel p;
    p.title = title;
    p.x_axis = ax("gap s [nm]");
    p.y_axis = ax("apparent barrier height φ_ap [eV]");
    return p;
}

// I(V) at a fixed gap over ±v_max, in a readable unit.
plot::xy_panel current_bias_panel(const config& c, double gap_m, double v_max, int threads) {
    const auto v = linspace(-v_max, v_max, 81);
    std::vector<double> I(v.size());
    detail::parallel_for(v.size(), threads, [&](std::size_t i) { I[i] = total_current(c.model, c.geometry, gap_m, v[i]); });
    double m = 0;
    for (double x : I) m = std::max(m, std::abs(x));
    auto [scale, unit] = current_unit(m);
    plot::series s{v, {}, "", plot::draw_style::line, 0};  // the title names the gap
    for (double x : I) s.y.push_back(x * scale);
    plot::xy_panel p;
    p.title = fmt::format("Current against bias at a gap of {:.3g} nm", gap_m * 1e9);
    p.x_axis = ax("sample bias V [V]");
    p.y_axis = ax(fmt::format("current I [{}]", unit));
    p.lines = {s};
    p.references = {{plot::orientation::horizontal, 0.0, ""}, {plot::orientation::vertical, 0.0, ""}};
    return p;
}

plot::reference_line contact_line() {
    return {plot::orientation::vertical, near_contact_gap_m * 1e9, "near contact (0.35 nm)"};
}

}  // namespace

namespace {

// "<what>: <tip> tip, <sample> sample, <geometry> geometry (model)".
std::string figure_title(const char* what, const config& c) {
    return fmt::format("{}: {} tip, {} sample, {} geometry (model)", what,
                       c.model.tip.material.empty() ? "custom" : c.model.tip.material,
                       c.model.sample.material.empty() ? "custom" : c.model.sample.material,
                       to_string(c.geometry.kind));
}

// The constant-current trace z(V) (several biases) or the gap against the setpoint current:
// one line per setpoint current (trace) or per bias (ladder).
plot::xy_panel plan_trace_panel(const std::vector<plan_point>& points, bool many_bias) {
    plot::xy_panel t;
    t.x_axis = many_bias ? ax("sample bias V [V]") : ax("current setpoint |I| [A]", plot::axis_scale::log10);
    t.y_axis = ax("planned gap s [nm]");
    std::vector<double> keys;
    for (const auto& p : points) {
        double k = many_bias ? p.setpoint_A : p.bias_V;
        if (std::find(keys.begin(), keys.end(), k) == keys.end()) keys.push_back(k);
    }
    for (double k : keys) {
        plot::series s;
        s.style = plot::draw_style::line_and_markers;
        s.label = many_bias ? "I = " + current_text(std::abs(k)) : fmt::format("V = {:g} V", k);
        for (const auto& p : points) {
            if ((many_bias ? p.setpoint_A : p.bias_V) != k) continue;
            s.x.push_back(many_bias ? p.bias_V : std::abs(p.setpoint_A));
            s.y.push_back(p.solution.gap_m * 1e9);  // NaN (unreachable) leaves a gap in the line
        }
        t.lines.push_back(s);
    }
    t.title = many_bias ? "Constant-current trace z(V)" : "Gap against setpoint current";
    return t;
}

// The reachable point the side panels are drawn at: nearest to the asked bias, else the first.
const plan_point* side_point(const std::vector<plan_point>& points, const std::optional<double>& bias_V) {
    const plan_point* best = nullptr;
    for (const auto& p : points) {
        if (!p.reachable()) continue;
        if (!best) best = &p;
        if (!bias_V) break;
        if (std::abs(p.bias_V - *bias_V) < std::abs(best->bias_V - *bias_V)) best = &p;
    }
    return best;
}

}  // namespace

void figure_options::validate() const {
    if (!(current_floor_A > 0) || !std::isfinite(current_floor_A))
        throw_input(location{"", 0, 0, "current_floor"}, fmt::format("must be a current > 0 A; got {:g} A", current_floor_A));
    if (side_bias_V && !std::isfinite(*side_bias_V)) throw_input(location{"", 0, 0, "plot_bias"}, "must be a finite bias");
}

plot::figure plan_figure(const config& c, const std::vector<plan_point>& points, int threads, const figure_options& o) {
    o.validate();
    const plan_point* first = side_point(points, o.side_bias_V);
    if (!first) throw error(error_kind::no_answer, "no reachable setpoint to plot");
    plot::figure f;
    f.title = figure_title("Setpoint plan", c);

    bool many_bias = false, many_current = false;
    for (const auto& p : points) {
        many_bias = many_bias || p.bias_V != points.front().bias_V;
        many_current = many_current || p.setpoint_A != points.front().setpoint_A;
    }
    if (many_bias || many_current) f.panels.push_back(plan_trace_panel(points, many_bias));

    const double s0 = first->solution.gap_m, V0 = first->bias_V;
    double lo = std::max(0.15e-9, s0 - 0.3e-9), hi = s0 + 0.6e-9;
    for (const auto& p : points)
        if (p.reachable() && p.bias_V == V0) {
            lo = std::min(lo, std::max(0.12e-9, p.solution.gap_m - 0.1e-9));
            hi = std::max(hi, p.solution.gap_m + 0.1e-9);
        }
    const gap_curve g = gap_dependence(c, V0, lo, hi, threads);

    plot::xy_panel ig = current_gap_panel(fmt::format("Current against gap at {:.4g} V", V0));
    ig.lines.push_back({g.gap_nm, g.current_A, "model", plot::draw_style::line, 0});
    plot::series marks{{}, {}, "planned setpoints", plot::draw_style::markers, 1};
    for (const auto& p : points)
        if (p.reachable() && p.bias_V == V0) {
            marks.x.push_back(p.solution.gap_m * 1e9);
            marks.y.push_back(std::abs(p.solution.current_A));
        }
    ig.lines.push_back(marks);
    ig.references.push_back(contact_line());
    clip_at_floor(ig, o.current_floor_A);
    f.panels.push_back(ig);

    plot::xy_panel bg = barrier_gap_panel(fmt::format("Apparent barrier height against gap at {:.4g} V", V0));
    bg.lines.push_back({g.gap_nm, g.barrier_eV, "from d ln|I|/ds", plot::draw_style::line, 0});
    bg.references.push_back(contact_line());
    bg.references.push_back({plot::orientation::horizontal,
                             0.5 * (c.model.tip.work_function_J + c.model.sample.work_function_J) / J_per_eV,
                             "mean work function"});
    f.panels.push_back(bg);

    double vmax = 0;
    for (const auto& p : points) vmax = std::max(vmax, std::abs(p.bias_V));
    f.panels.push_back(current_bias_panel(c, s0, std::min(c.model.bias_limit_V, 1.5 * vmax), threads));
    f.columns = f.panels.size() > 1 ? 2 : 1;
    return f;
}

namespace {

// predict's results over the gap × bias lists, bias-major: r[ib * gaps + ig].
struct prediction_table {
    const std::vector<double>& gaps;
    const std::vector<double>& biases;
    const std::vector<prediction>& r;
    const prediction& at(std::size_t ib, std::size_t ig) const { return r[ib * gaps.size() + ig]; }
};

bool ascending(const std::vector<double>& v) {
    for (std::size_t i = 1; i < v.size(); ++i)
        if (!(v[i] > v[i - 1])) return false;
    return true;
}

// log10 |I| over the (gap, bias) grid (both lists ascending, more than one value each) in the
// data's unit; cells below the floor take the darkest colour, as nothing is measured there.
plot::colour_map_panel prediction_map(const prediction_table& t, const figure_options& o) {
    plot::colour_map_panel m;
    m.title = "log₁₀ |I| over gap and bias";
    m.x_axis = ax("gap s [nm]");
    m.y_axis = ax("sample bias V [V]");
    for (double s : t.gaps) m.x.push_back(s * 1e9);
    m.y = t.biases;
    double top = 0.0;
    for (const prediction& q : t.r) top = std::max(top, std::abs(q.current_A));
    const auto unit = figures_detail::current_unit(top);
    bool below_floor = false;
    for (const prediction& q : t.r) {  // bias outer, gap inner: the map's row-major order
        const double I = std::abs(q.current_A);
        below_floor = below_floor || (I > 0 && I < o.current_floor_A);
        m.z.push_back(I > 0 ? std::log10(I * unit.per_A) : std::numeric_limits<double>::quiet_NaN());
    }
    if (below_floor) m.z_min = std::log10(o.current_floor_A * unit.per_A);
    m.colour_bar_label = fmt::format("log₁₀(|I| / 1 {})", unit.name);
    return m;
}

// Current and apparent barrier against gap. At most five biases as lines, spread over the list.
// At V = 0 there is no current (and predict reports the barrier from the conductance): that line
// stays off the current panel.
void add_gap_panels(plot::figure& f, const prediction_table& t, const figure_options& o) {
    const std::size_t ng = t.gaps.size(), nb = t.biases.size();
    plot::xy_panel ig = current_gap_panel("Current against gap");
    plot::xy_panel bg = barrier_gap_panel("Apparent barrier height against gap");
    const std::size_t lines = std::min<std::size_t>(nb, 5);
    for (std::size_t l = 0; l < lines; ++l) {
        const std::size_t ib = lines == 1 ? 0 : l * (nb - 1) / (lines - 1);
        plot::series a, b;
        a.label = b.label = fmt::format("V = {:g} V", t.biases[ib]);
        a.look = b.look = static_cast<int>(l);
        for (std::size_t k = 0; k < ng; ++k) {
            a.x.push_back(t.gaps[k] * 1e9);
            a.y.push_back(std::abs(t.at(ib, k).current_A));
            b.x.push_back(t.gaps[k] * 1e9);
            b.y.push_back(t.at(ib, k).q.apparent_barrier_J / J_per_eV);
        }
        a.style = b.style = ng > 25 ? plot::draw_style::line : plot::draw_style::line_and_markers;
        if (t.biases[ib] != 0.0) ig.lines.push_back(a);
        bg.lines.push_back(b);
    }
    ig.references.push_back(contact_line());
    clip_at_floor(ig, o.current_floor_A);
    f.panels.push_back(ig);
    f.panels.push_back(bg);
}

// Current against bias for at most five gaps, spread over the list.
plot::xy_panel bias_panel(const prediction_table& t, const figure_options& o) {
    const std::size_t ng = t.gaps.size(), nb = t.biases.size();
    plot::xy_panel ib_panel;
    ib_panel.title = "Current against bias";
    ib_panel.x_axis = ax("sample bias V [V]");
    double m = 0, m_small = std::numeric_limits<double>::infinity();
    const std::size_t lines = std::min<std::size_t>(ng, 5);
    std::vector<std::size_t> picked;
    for (std::size_t l = 0; l < lines; ++l) picked.push_back(lines == 1 ? 0 : l * (ng - 1) / (lines - 1));
    for (std::size_t ig : picked) {
        double mi = 0;
        for (std::size_t k = 0; k < nb; ++k) mi = std::max(mi, std::abs(t.at(k, ig).current_A));
        m = std::max(m, mi);
        m_small = std::min(m_small, mi);
    }
    // Curves more than two decades apart vanish on a linear axis: then |I| on a log axis.
    const bool log_axis = m_small > 0 && m / m_small > 100.0;
    auto [scale, unit] = current_unit(m);
    ib_panel.y_axis = log_axis ? ax("|current| [A]", plot::axis_scale::log10) : ax(fmt::format("current I [{}]", unit));
    for (std::size_t l = 0; l < picked.size(); ++l) {
        const std::size_t ig = picked[l];
        plot::series s;
        s.label = fmt::format("s = {:g} nm", t.gaps[ig] * 1e9);
        s.style = nb > 25 ? plot::draw_style::line : plot::draw_style::line_and_markers;
        for (std::size_t k = 0; k < nb; ++k) {
            s.x.push_back(t.biases[k]);
            s.y.push_back(log_axis ? std::abs(t.at(k, ig).current_A) : t.at(k, ig).current_A * scale);
        }
        ib_panel.lines.push_back(s);
    }
    if (log_axis) clip_at_floor(ib_panel, o.current_floor_A);
    else ib_panel.references = {{plot::orientation::horizontal, 0.0, ""}};
    return ib_panel;
}

// One point: its neighbourhood in gap and bias.
void add_point_panels(plot::figure& f, const config& c, const prediction_table& t, int threads, const figure_options& o) {
    const double s0 = t.gaps[0], V0 = t.biases[0];
    const gap_curve g = gap_dependence(c, V0 == 0.0 ? 1e-3 : V0, std::max(0.15e-9, s0 - 0.3e-9), s0 + 0.6e-9, threads);
    plot::xy_panel ig = current_gap_panel(fmt::format("Current against gap at {:.4g} V", V0));
    ig.lines.push_back({g.gap_nm, g.current_A, "model", plot::draw_style::line, 0});
    ig.lines.push_back({{s0 * 1e9}, {std::abs(t.r[0].current_A)}, "this point", plot::draw_style::markers, 1});
    ig.references.push_back(contact_line());
    clip_at_floor(ig, o.current_floor_A);
    plot::xy_panel bg = barrier_gap_panel(fmt::format("Apparent barrier height against gap at {:.4g} V", V0));
    bg.lines.push_back({g.gap_nm, g.barrier_eV, "from d ln|I|/ds", plot::draw_style::line, 0});
    f.panels.push_back(ig);
    f.panels.push_back(bg);
    f.panels.push_back(current_bias_panel(c, s0, std::min(c.model.bias_limit_V, std::max(0.5, 1.5 * std::abs(V0))), threads));
}

}  // namespace

plot::figure predict_figure(const config& c, const std::vector<double>& gaps, const std::vector<double>& biases,
                            const std::vector<prediction>& r, int threads, const figure_options& o) {
    o.validate();
    if (r.size() != gaps.size() * biases.size() || r.empty())
        throw_input({}, "predict_figure: the results do not match the gap and bias lists");
    plot::figure f;
    f.title = figure_title("Prediction", c);
    const prediction_table t{gaps, biases, r};
    const std::size_t ng = gaps.size(), nb = biases.size();
    if (ng > 1 && nb > 1 && ascending(gaps) && ascending(biases)) f.panels.push_back(prediction_map(t, o));
    if (ng > 1) add_gap_panels(f, t, o);
    if (nb > 1) f.panels.push_back(bias_panel(t, o));
    if (ng == 1 && nb == 1) add_point_panels(f, c, t, threads, o);
    f.columns = f.panels.size() > 1 ? 2 : 1;
    return f;
}

}  // namespace tipgap
