#include "tipgap/atomic_file.hpp"

#include <atomic>
#include <cstdio>
#include <filesystem>
#include <fcntl.h>
#include <fmt/format.h>
#include <unistd.h>

#include "tipgap/error.hpp"

namespace tipgap {

std::string temporary_sibling(const std::string& path) {
    static std::atomic<unsigned> counter{0};
    std::filesystem::path p(path);
    std::string name = p.filename().string();
    std::filesystem::path dir = p.parent_path();
    std::string tmp_name = fmt::format(".{}.tmp-{}-{}", name, static_cast<long>(::getpid()), counter++);
    return (dir / tmp_name).string();
}

atomic_output::atomic_output(std::string path) : path_(std::move(path)), tmp_(temporary_sibling(path_)) {
    out_.open(tmp_, std::ios::binary | std::ios::trunc);
    if (!out_) {
        location w;
        w.file = path_;
        throw_input(w, "cannot open for writing (does the directory exist and is it writable?)");
    }
}

atomic_output::~atomic_output() {
    if (!committed_) {
        out_.close();
        std::remove(tmp_.c_str());
    }
}

void atomic_output::commit() {
    out_.flush();
    bool ok = static_cast<bool>(out_);
    out_.close();
    location w;
    w.file = path_;
    if (!ok) {
        std::remove(tmp_.c_str());
        committed_ = true;
        throw_input(w, "write failed (disk full?)");
    }
    int fd = ::open(tmp_.c_str(), O_RDONLY);
    if (fd >= 0) {
        ::fsync(fd);
        ::close(fd);
    }
    if (std::rename(tmp_.c_str(), path_.c_str()) != 0) {
        std::remove(tmp_.c_str());
        committed_ = true;
        throw_input(w, "cannot replace the file");
    }
    committed_ = true;
}

atomic_directory::atomic_directory(std::string path) : path_(std::move(path)) {
    namespace fs = std::filesystem;
    location w;
    w.file = path_;
    std::error_code ec;
    if (fs::exists(path_, ec) && !fs::is_directory(path_, ec)) {
        throw_input(w, "exists and is not a directory; expected a directory name for the output");
    }
    tmp_ = temporary_sibling(path_);
    if (!fs::create_directory(tmp_, ec) || ec) {
        throw_input(w, "cannot create the output directory (does the parent exist and is it writable?)");
    }
}

atomic_directory::~atomic_directory() {
    if (!committed_) {
        std::error_code ec;
        std::filesystem::remove_all(tmp_, ec);
    }
}

void atomic_directory::commit() {
    namespace fs = std::filesystem;
    location w;
    w.file = path_;
    std::error_code ec;
    // rename() cannot replace a non-empty directory: move the old one aside first. Between the
    // two renames the target is briefly absent (never partial); a crash there leaves the old
    // output under its hidden temporary name.
    std::string aside;
    if (fs::exists(path_, ec)) {
        aside = temporary_sibling(path_);
        if (std::rename(path_.c_str(), aside.c_str()) != 0) throw_input(w, "cannot move the old output directory aside");
    }
    if (std::rename(tmp_.c_str(), path_.c_str()) != 0) {
        if (!aside.empty()) std::rename(aside.c_str(), path_.c_str());
        throw_input(w, "cannot put the output directory in place");
    }
    committed_ = true;
    if (!aside.empty()) fs::remove_all(aside, ec);
}

void write_file_atomically(const std::string& path, std::string_view content) {
    atomic_output out(path);
    out.stream().write(content.data(), static_cast<std::streamsize>(content.size()));
    out.commit();
}

}  // namespace tipgap
