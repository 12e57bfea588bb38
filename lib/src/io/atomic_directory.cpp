// Output directories written whole or not at all (see atomic_directory.hpp).
#include "tipgap/io/atomic_directory.hpp"

#include <algorithm>
#include <cstdio>
#include <fcntl.h>
#include <filesystem>
#include <fmt/format.h>
#include <unistd.h>

#include "tipgap/io/atomic_file.hpp"
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
    tmp_ = temporary_sibling(target_);
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
    const location where{target_, 0, 0, ""};
    std::error_code ec;
    std::string old;
    if (fs::exists(fs::symlink_status(target_, ec))) {
        old = temporary_sibling(target_);
        if (std::rename(target_.c_str(), old.c_str()) != 0) {
            throw_input(where, "cannot move the existing directory aside to replace it");
        }
    }
    if (std::rename(tmp_.c_str(), target_.c_str()) != 0) {
        if (!old.empty()) std::rename(old.c_str(), target_.c_str());
        throw_input(where, "cannot rename the finished output into place");
    }
    committed_ = true;
    const fs::path parent = fs::path(target_).parent_path();
    fsync_path(parent.empty() ? "." : parent.string());
    if (!old.empty()) fs::remove_all(old, ec);
}

}  // namespace tipgap
