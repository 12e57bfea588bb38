#pragma once
// Output directories that appear whole or not at all: everything is written into a temporary
// sibling directory, which is renamed onto the target only when complete. A failed or killed run
// leaves at most a hidden ".<name>.tmp-<pid>-<n>" directory, never a partial target.
#include <memory>
#include <string>
#include <vector>

#include "tipgap/core/interrupt.hpp"

namespace tipgap {

class atomic_directory {
public:
    // target: the directory to produce; its parent must exist and be writable.
    // replaceable: the file names a previous output holds. An existing target is replaced only
    // when it is a directory holding nothing else (so that a typo cannot delete a user's files).
    // Throws tipgap::error (input) naming the target when it cannot be replaced or the temporary
    // directory cannot be created.
    atomic_directory(std::string target, std::vector<std::string> replaceable);
    atomic_directory(const atomic_directory&) = delete;
    atomic_directory& operator=(const atomic_directory&) = delete;
    // Removes the temporary directory and its contents unless committed.
    ~atomic_directory();

    // The temporary directory, and the path of a file in it.
    const std::string& temporary_path() const { return tmp_; }
    std::string file(const std::string& name) const;

    // Puts the temporary directory in place of the target: an existing target is swapped with it
    // in one step (renameat2 RENAME_EXCHANGE) and then removed, so that no instant exists without
    // the output directory. Inside an output_transaction the swap happens at its commit. Stale
    // temporaries of dead processes beside the target are removed when the run starts.
    // Throws tipgap::error (input).
    void commit();

private:
    void check_replaceable() const;
    std::string target_;
    std::vector<std::string> replaceable_;
    std::string tmp_;
    std::unique_ptr<registered_temporary> registration_;
    bool committed_ = false;
};

}  // namespace tipgap
