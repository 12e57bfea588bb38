// Output directories written whole or not at all (see atomic_directory.hpp).
#include "tipgap/io/atomic_directory.hpp"

#include <algorithm>
#include <cstdio>
#include <cerrno>
#include <cstring>
#include <fcntl.h>
#include <stdio.h>
#include <filesystem>
#include <fmt/format.h>
#include <unistd.h>

#include "io/detail/replace_directory.hpp"
#include "tipgap/io/atomic_file.hpp"
#include "tipgap/io/output_path.hpp"
#include "tipgap/io/output_transaction.hpp"
#include "tipgap/core/error.hpp"

namespace tipgap {
namespace fs = std::filesystem;

namespace {

// A trailing slash ("out/") would make the temporary a child of the target.
std::string without_trailing_slash(std::string p) {
    while (p.size() > 1 && p.back() == '/') p.pop_back();
    return p;
}

void fsync_path(const std::string& p) {
    const int fd = ::open(p.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
    if (fd >= 0) {
        ::fsync(fd);
        ::close(fd);
    }
}

}  // namespace

atomic_directory::atomic_directory(std::string target, std::vector<std::string> replaceable)
    : target_(without_trailing_slash(std::move(target))), replaceable_(std::move(replaceable)) {
    check_replaceable();
    remove_stale_temporaries(target_);
    tmp_ = temporary_sibling(target_);
    registration_ = std::make_unique<registered_temporary>(tmp_, true);
    std::error_code ec;
    if (!fs::create_directory(tmp_, ec) || ec) {
        throw_input(location{target_, 0, 0, ""},
                    fmt::format("cannot create a directory beside it ({}); does the parent directory exist and is it "
                                "writable?",
                                ec ? ec.message() : "it exists"));
    }
}

atomic_directory::~atomic_directory() {
    if (!committed_) {
        std::error_code ec;
        fs::remove_all(tmp_, ec);
    }
}

std::string atomic_directory::file(const std::string& name) const { return (fs::path(tmp_) / name).string(); }

void atomic_directory::check_replaceable() const {
    std::error_code ec;
    const fs::file_status st = fs::symlink_status(target_, ec);
    if (!fs::exists(st)) return;
    if (!fs::is_directory(st)) {
        throw_input(location{target_, 0, 0, ""}, "exists and is not a directory; choose another output directory");
    }
    for (const fs::directory_entry& e : fs::directory_iterator(target_, ec)) {
        const std::string name = e.path().filename().string();
        if (std::find(replaceable_.begin(), replaceable_.end(), name) == replaceable_.end()) {
            throw_input(location{target_, 0, 0, ""},
                        fmt::format("exists and holds '{}', which this command does not write; it replaces only an "
                                    "empty directory or its own earlier output. Remove it or choose another directory",
                                    name));
        }
    }
}

void atomic_directory::commit() {
    fsync_path(tmp_);
    check_replaceable();
    committed_ = true;
    finish_output({tmp_, target_, target_, true});
}

namespace detail {

void replace_directory(const std::string& tmp, const std::string& target, const std::string& user_path) {
    const location where{user_path, 0, 0, ""};
    std::error_code ec;
    const bool exists = fs::exists(fs::symlink_status(target, ec));
    if (!exists) {
        if (std::rename(tmp.c_str(), target.c_str()) != 0) {
            const int err = errno;
            fs::remove_all(tmp, ec);
            throw_input(where, fmt::format("cannot rename the finished output into place: {}", std::strerror(err)));
        }
    } else if (::renameat2(AT_FDCWD, tmp.c_str(), AT_FDCWD, target.c_str(), RENAME_EXCHANGE) != 0) {
        const int err = errno;
        fs::remove_all(tmp, ec);
        throw_input(where, fmt::format("cannot swap the finished output into place: {}", std::strerror(err)));
    }
    const fs::path parent = fs::path(target).parent_path();
    fsync_path(parent.empty() ? "." : parent.string());
    if (exists) fs::remove_all(tmp, ec);  // after the exchange, tmp names the old tree
}

}  // namespace detail
}  // namespace tipgap
