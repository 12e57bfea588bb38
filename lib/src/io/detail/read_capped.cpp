#include "io/detail/read_capped.hpp"

#include <cerrno>
#include <cstring>
#include <fcntl.h>
#include <fmt/format.h>
#include <sys/stat.h>
#include <unistd.h>

#include "tipgap/core/error.hpp"

namespace tipgap::detail {
namespace {

struct fd_closer {
    int fd;
    ~fd_closer() {
        if (fd >= 0) ::close(fd);
    }
};

std::string size_text(std::size_t bytes) {
    return bytes >= (std::size_t{1} << 20) ? fmt::format("{} MiB", bytes >> 20) : fmt::format("{} KiB", bytes >> 10);
}

}  // namespace

std::string read_capped(const std::string& path, std::size_t cap, bool regular_unlimited, const char* what) {
    const location where{path, 0, 0, ""};
    // O_NONBLOCK: opening a FIFO without a writer must not hang; cleared again for the reads.
    fd_closer f{::open(path.c_str(), O_RDONLY | O_CLOEXEC | O_NONBLOCK)};
    if (f.fd < 0) throw_input(where, fmt::format("cannot open the file for reading: {}", std::strerror(errno)));
    struct stat st {};
    if (::fstat(f.fd, &st) != 0) throw_input(where, fmt::format("cannot read the file: {}", std::strerror(errno)));
    if (S_ISDIR(st.st_mode)) throw_input(where, fmt::format("this is a directory; expected {}", what));
    ::fcntl(f.fd, F_SETFL, ::fcntl(f.fd, F_GETFL) & ~O_NONBLOCK);
    const bool regular = S_ISREG(st.st_mode);
    const std::size_t limit = regular && regular_unlimited ? static_cast<std::size_t>(-1) : cap;
    if (regular && static_cast<std::size_t>(st.st_size) > limit)
        throw_input(where, fmt::format("the file has {} bytes; expected {} of at most {}", st.st_size, what, size_text(cap)));
    std::string text;
    if (regular) text.reserve(static_cast<std::size_t>(st.st_size));
    char buf[1 << 16];
    for (;;) {
        const ssize_t n = ::read(f.fd, buf, sizeof buf);
        if (n < 0 && errno == EINTR) continue;
        if (n < 0) throw_input(where, fmt::format("cannot read the file: {}", std::strerror(errno)));
        if (n == 0) break;
        text.append(buf, static_cast<std::size_t>(n));
        if (text.size() > limit)
            throw_input(where, fmt::format("more than {} read from this {}; expected {} of at most {} (copy it to a "
                                           "regular file if it is really that large)",
                                           size_text(cap), regular ? "file" : "pipe or device", what, size_text(cap)));
    }
    return text;
}

}  // namespace tipgap::detail
