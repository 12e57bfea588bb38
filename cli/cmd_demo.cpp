// tipgap demo: the main job on the built-in config. Runs the library's demo (predict, fit every
// curve of the synthetic demo_scans/ set, compare with the ground truth), prints a summary table
// and writes CSV, JSON and PNG figures into --out, each file atomically.
#include <chrono>
#include <filesystem>
#include <fmt/format.h>
#include <memory>
#include <string>
#include <system_error>
#include <vector>

#include "command.hpp"
#include "flags.hpp"
#include "output.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/demo/demo_text.hpp"

namespace tipgap::cli {
namespace {

namespace fs = std::filesystem;

struct demo_args {
    std::string out = "tipgap-demo";
    std::string scans;  // empty: beside the executable
    int threads = 0;
    bool no_model = false;
};

// The demo scans beside the executable: <bin>/<TIPGAP_DEMO_SCANS_FROM_BIN> (the installed data
// directory; the build tree mirrors it), then <bin>/demo_scans. No path is compiled in.
std::string find_demo_scans() {
    std::error_code ec;
    const fs::path bin = fs::read_symlink("/proc/self/exe", ec).parent_path();
    std::vector<fs::path> tried;
    for (const fs::path& p : {bin / TIPGAP_DEMO_SCANS_FROM_BIN, bin / "demo_scans"}) {
        tried.push_back(p.lexically_normal());
        if (fs::is_directory(tried.back(), ec)) return tried.back().string();
    }
    throw_input(location{"", 0, 0, "--scans"},
                fmt::format("no demo scans beside the executable (looked in {} and {}); expected --scans DIR",
                            tried[0].string(), tried[1].string()));
}

// The options a file in another layout was read with, as `tipgap fit` takes them.
void print_read_options(const demo_report& r) {
    const measured_curve* last = nullptr;
    for (const demo_curve& d : r.curves) {
        if (d.curve.get() == last) continue;
        last = d.curve.get();
        std::string flags;
        for (const auto& [key, value] : settings(d.read))
            flags += fmt::format(" {}{}{}", flag_for("fit", key), value.empty() ? "" : " ", value);
        const std::string name = fs::path(d.curve->file).filename().string();
        if (!flags.empty()) fmt::print("note: {} is in another layout, read as: tipgap fit {}{}\n", name, name, flags);
        if (d.fit.model == fit_model::offset)
            fmt::print("note: {} has an amplifier offset, fitted as: tipgap fit {} (the default offset model)\n", name, name);
    }
}

void run(const demo_args& a) {
    const auto t0 = std::chrono::steady_clock::now();
    demo_options o;
    o.scans_dir = a.scans.empty() ? find_demo_scans() : a.scans;
    o.threads = a.threads;
    o.model_comparison = !a.no_model;
    const demo_report r = run_demo(o);
    write_demo_directory(r, a.out);
    fmt::print("{}", demo_overview_text(r, o));
    for (const plan_point& p : r.plan) print_warnings(p.warnings, fmt::format("plan {:.3g} A", p.setpoint_A));
    fmt::print("{}", demo_results_text(r, o));
    print_read_options(r);
    const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    fmt::print("wrote {}/{{prediction.csv, fits.csv, demo.json, prediction.png, fit-*.png{}}} in {:.1f} s\n", a.out,
               r.resonances.empty() ? "" : ", resonance-*.png", seconds);
}

}  // namespace

command demo_command() {
    auto a = std::make_shared<demo_args>();
    command cmd{"demo", "The main job on the built-in config: predict, fit the synthetic demo curves, compare with their "
                        "truth, write a report"};
    cmd.flags = {
        {"--out", "Report directory (default ./tipgap-demo)", &a->out, "DIR"},
        {"--scans", "Curve directory (default: the demo_scans installed beside the executable)", &a->scans, "DIR"},
        {"--threads", "Worker threads (default: all cores)", &a->threads, "", false, std::pair{0, 256}},
        {"--no-model", "Skip the model comparison (mean work function fit)", &a->no_model},
    };
    cmd.run = [a](const std::string&) { run(*a); };
    return cmd;
}

}  // namespace tipgap::cli
