#include "tipgap/figures/map_directory.hpp"

#include <future>

#include "tipgap/core/constants.hpp"
#include "tipgap/io/atomic_file.hpp"

namespace tipgap {

namespace {

// The matrices and the quality codes, each file atomically.
void write_matrices(const barrier_map& m, const atomic_directory& dir) {
    const scaling to_eV = times(1.0 / si::electron_volt);
    write_file_atomically(dir.file("apparent_barrier_eV.csv"),
                          map_matrix_csv(m, "apparent barrier height [eV]", m.apparent_barrier_J, to_eV));
    write_file_atomically(dir.file("decay_constant_per_nm.csv"),
                          map_matrix_csv(m, "decay constant [1/nm]", m.decay_constant_per_m, times(1e-9)));
    write_file_atomically(dir.file("stderr_apparent_barrier_eV.csv"),
                          map_matrix_csv(m, "standard error of the apparent barrier height [eV]", m.apparent_barrier_stderr_J, to_eV));
    write_file_atomically(dir.file("quality.csv"), map_quality_csv(m));
}

}  // namespace

void write_map_directory(const barrier_map& m, const map_options& o, const atomic_directory& dir,
                         map_directory_options d) {
    const auto t1 = std::chrono::steady_clock::now();
    auto matrices = std::async(std::launch::async, [&] { write_matrices(m, dir); });
    if (d.figures) {
        plot::write_figure(barrier_map_figure(m, d.figure), dir.file("barrier_map.png"));
        plot::write_figure(stderr_map_figure(m), dir.file("stderr_map.png"));
        plot::write_figure(quality_map_figure(m), dir.file("quality_map.png"));
        plot::write_figure(barrier_histogram_figure(m), dir.file("barrier_histogram.png"));
    }
    matrices.get();
    const auto t2 = std::chrono::steady_clock::now();
    d.run.output_seconds = std::chrono::duration<double>(t2 - t1).count();
    d.run.total_seconds = std::chrono::duration<double>(t2 - d.started).count();
    write_file_atomically(dir.file("summary.json"), json_text(map_summary(m, o, d.run)));
}

}  // namespace tipgap
