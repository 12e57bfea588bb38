#pragma once
// The final step of an atomic_directory (atomic_directory.cpp), shared with output_transaction.
#include <string>

namespace tipgap::detail {

// Puts the finished directory `tmp` in place of `target` in one step: renameat2 with
// RENAME_EXCHANGE when the target exists (no instant without an output directory), then removes
// the old tree; a plain rename otherwise. user_path names the target in messages.
void replace_directory(const std::string& tmp, const std::string& target, const std::string& user_path);

}  // namespace tipgap::detail
