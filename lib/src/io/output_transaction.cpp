// All-or-nothing outputs of a run (output_transaction.hpp).
#include "tipgap/io/output_transaction.hpp"

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <fcntl.h>
#include <filesystem>
#include <fmt/format.h>
#include <unistd.h>

#include "io/detail/replace_directory.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap {
namespace {

output_transaction* current = nullptr;

void fsync_directory_of(const std::string& path) {
    const std::filesystem::path parent = std::filesystem::path(path).parent_path();
    const int fd = ::open(parent.empty() ? "." : parent.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
    if (fd >= 0) {
        ::fsync(fd);
        ::close(fd);
    }
}

void remove_temporary(const output_transaction::pending& p) {
    std::error_code ec;
    std::filesystem::remove_all(p.temporary, ec);
}

void put_in_place(const output_transaction::pending& p) {
    if (p.directory) {
        detail::replace_directory(p.temporary, p.target, p.user_path);
        return;
    }
    if (std::rename(p.temporary.c_str(), p.target.c_str()) != 0) {
        const int err = errno;
        remove_temporary(p);
        throw_input(location{p.user_path, 0, 0, ""}, fmt::format("cannot replace the file: {}", std::strerror(err)));
    }
    fsync_directory_of(p.target);
}

}  // namespace

output_transaction* current_output_transaction() { return current; }

output_transaction::output_transaction(std::vector<std::string> inputs) : inputs_(std::move(inputs)), outer_(current) {
    current = this;
}

output_transaction::~output_transaction() {
    if (!committed_)
        for (const pending& p : pending_) remove_temporary(p);
    current = outer_;
}

void output_transaction::commit() {
    interrupts_held hold;
    committed_ = true;
    std::size_t done = 0;
    try {
        for (; done < pending_.size(); ++done) put_in_place(pending_[done]);
    } catch (...) {
        for (std::size_t i = done + 1; i < pending_.size(); ++i) remove_temporary(pending_[i]);
        registrations_.clear();
        throw;
    }
    registrations_.clear();
}

void finish_output(output_transaction::pending p) {
    if (current == nullptr || current->committed_) {
        put_in_place(p);
        return;
    }
    current->registrations_.push_back(std::make_unique<registered_temporary>(p.temporary, p.directory));
    current->pending_.push_back(std::move(p));
}

}  // namespace tipgap
