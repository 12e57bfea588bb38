#pragma once
// Outputs appear whole or not at all: write to a temporary file beside the target, then rename.
#include <fstream>
#include <string>
#include <string_view>

namespace tipgap {

// Writes `content` to `path` atomically (temporary file in the same directory, fsync, rename).
// Throws tipgap::error (input) naming the path when the directory is not writable.
void write_file_atomically(const std::string& path, std::string_view content);

// A file being written. Data goes to "<dir>/.<name>.tmp-<pid>-<n>"; commit() renames it onto the
// target. Destroying an uncommitted atomic_output removes the temporary, leaving any old file intact.
class atomic_output {
public:
    explicit atomic_output(std::string path);
    atomic_output(const atomic_output&) = delete;
    atomic_output& operator=(const atomic_output&) = delete;
    ~atomic_output();
    std::ofstream& stream() { return out_; }
    const std::string& temporary_path() const { return tmp_; }
    void commit();

private:
    std::string path_;
    std::string tmp_;
    std::ofstream out_;
    bool committed_ = false;
};

// Unique temporary sibling name for `path` (used for files and for output directories).
std::string temporary_sibling(const std::string& path);

}  // namespace tipgap
