#pragma once
// Outputs appear whole or not at all: write to a temporary file beside the target, check every
// write, fsync and close, then rename (or hand the temporary to the run's output_transaction).
#include <memory>
#include <ostream>
#include <string>
#include <string_view>

#include "tipgap/core/interrupt.hpp"

namespace tipgap {

// Writes `content` to `path` atomically (see atomic_output). Throws tipgap::error (input) naming
// `path` when it cannot be written.
void write_file_atomically(const std::string& path, std::string_view content);

// A file being written. The path goes through output_target() (links written through, special
// files and the run's inputs refused); data goes to "<dir>/.<name>.tmp-<pid>-<n>" beside the
// target; commit() checks that every byte was written (short writes, ENOSPC, EIO), fsyncs and
// closes, then renames it onto the target. A failed write or commit, an interrupt
// (core/interrupt.hpp) or destroying an uncommitted atomic_output removes the temporary, leaving
// any old file intact. Errors name the user's path, never the temporary.
class atomic_output {
public:
    explicit atomic_output(std::string path);
    atomic_output(const atomic_output&) = delete;
    atomic_output& operator=(const atomic_output&) = delete;
    ~atomic_output();
    std::ostream& stream() { return *out_; }
    const std::string& temporary_path() const { return tmp_; }
    void commit();

private:
    std::string path_;    // as the user named it
    std::string target_;  // with links resolved
    std::string tmp_;
    int fd_ = -1;
    std::unique_ptr<std::streambuf> buf_;
    std::unique_ptr<std::ostream> out_;
    registered_temporary registration_;
    bool committed_ = false;
};

// Unique temporary sibling name for `path` (used for files and for output directories).
std::string temporary_sibling(const std::string& path);

// Writes all of `data` to standard output and flushes it. Throws tipgap::error (input, "standard
// output") on a failed write (a full disk, /dev/full, a closed descriptor). A closed pipe raises
// SIGPIPE, which ends the run quietly (core/interrupt.hpp).
void write_stdout(std::string_view data);

}  // namespace tipgap
