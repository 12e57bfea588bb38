#include "tipgap/io/atomic_file.hpp"

#include <atomic>
#include <cstdio>
#include <filesystem>
#include <fcntl.h>
#include <fmt/format.h>
#include <unistd.h>

#include "tipgap/core/error.hpp"

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

void write_file_atomically(const std::string& path, std::string_view content) {
    atomic_output out(path);
    out.stream().write(content.data(), static_cast<std::streamsize>(content.size()));
    out.commit();
}

}  // namespace tipgap
