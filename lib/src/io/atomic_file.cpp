#include "tipgap/io/atomic_file.hpp"

#include <atomic>
#include <cerrno>
#include <cstdio>
#include <cstring>
#include <fcntl.h>
#include <filesystem>
#include <fmt/format.h>
#include <unistd.h>

#include "io/detail/fd_writer.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/io/output_path.hpp"
#include "tipgap/io/output_transaction.hpp"

namespace tipgap {

std::string temporary_sibling(const std::string& path) {
    static std::atomic<unsigned> counter{0};
    std::filesystem::path p(path);
    std::string name = p.filename().string();
    std::filesystem::path dir = p.parent_path();
    std::string tmp_name = fmt::format(".{}.tmp-{}-{}", name, static_cast<long>(::getpid()), counter++);
    return (dir / tmp_name).string();
}

namespace {

int open_exclusive(const std::string& path) {
    return ::open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0666);
}

}  // namespace

atomic_output::atomic_output(std::string path)
    : path_(std::move(path)), target_(output_target(path_)), tmp_(temporary_sibling(target_)),
      registration_(tmp_, false) {
    remove_stale_temporaries(target_);
    fd_ = open_exclusive(tmp_);
    if (fd_ < 0) {
        registration_.release();
        throw_input(location{path_, 0, 0, ""},
                    fmt::format("cannot open for writing ({}); does the directory exist and is it writable?",
                                std::strerror(errno)));
    }
    buf_ = std::make_unique<detail::fd_writer>(fd_);
    out_ = std::make_unique<std::ostream>(buf_.get());
}

atomic_output::~atomic_output() {
    if (committed_) return;
    if (fd_ >= 0) ::close(fd_);
    std::remove(tmp_.c_str());
}

void atomic_output::commit() {
    out_->flush();
    int err = static_cast<detail::fd_writer&>(*buf_).error();
    if (err == 0 && !*out_) err = EIO;
    if (err == 0 && ::fsync(fd_) != 0) err = errno;
    if (::close(fd_) != 0 && err == 0) err = errno;
    fd_ = -1;
    committed_ = true;
    if (err != 0) {
        std::remove(tmp_.c_str());
        throw_input(location{path_, 0, 0, ""},
                    fmt::format("cannot write the file: {}{}; nothing was written", std::strerror(err),
                                err == ENOSPC || err == EDQUOT ? " (the disk is full)" : ""));
    }
    finish_output({tmp_, target_, path_, false});
    registration_.release();
}

void write_file_atomically(const std::string& path, std::string_view content) {
    atomic_output out(path);
    out.stream().write(content.data(), static_cast<std::streamsize>(content.size()));
    out.commit();
}

void write_stdout(std::string_view data) {
    std::fflush(stdout);
    const int err = detail::write_fully(STDOUT_FILENO, data.data(), data.size());
    if (err != 0)
        throw_input(location{"standard output", 0, 0, ""},
                    fmt::format("cannot write: {}{}", std::strerror(err),
                                err == ENOSPC ? " (the disk is full)" : err == EBADF ? " (standard output is closed)" : ""));
}

}  // namespace tipgap
