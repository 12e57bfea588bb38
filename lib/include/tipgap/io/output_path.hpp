#pragma once
// Where an output really goes, and which outputs a run may not write. Every file tipgap writes
// passes output_target() before its temporary is created; the CLI also calls check_run_paths()
// with the run's input and output paths before any work.
#include <string>
#include <vector>

namespace tipgap {

// The file an output path stands for. A symbolic link is written through: the result is the
// link's final target (relative links resolved against the link's directory, up to 40 levels),
// so the link stays and its target gets the new content. Refused (tipgap::error, input, naming
// `path`): an existing FIFO, socket, device or directory; paths under /dev and /proc (write to
// standard output with "-"); a target that is one of the run's inputs or another output of the
// same run (see output_transaction). path: as the user gave it, not empty, not "-".
std::string output_target(const std::string& path);

// One output of a run, as the user named it. directory: an output directory (map, demo).
struct run_output {
    std::string path;
    bool directory = false;
};

// Refuses, before any work, an output that is one of the inputs (the same file by device and
// inode, also through links; or the same path once links are resolved), two outputs on the same
// path, and an output file that cannot be one (output_target). Paths that are empty or "-" are
// skipped; inputs that do not exist are skipped (their reader reports them).
void check_run_paths(const std::vector<std::string>& inputs, const std::vector<run_output>& outputs);

// Removes temporaries ".<name>.tmp-<pid>-<n>" beside `target` whose process is gone (left by a
// run killed with SIGKILL). Those of live processes, and anything else, are left alone.
void remove_stale_temporaries(const std::string& target);

}  // namespace tipgap
