#include "io/detail/fd_writer.hpp"

#include <cerrno>
#include <unistd.h>

namespace tipgap::detail {

int write_fully(int fd, const char* p, std::size_t n) {
    while (n > 0) {
        const ssize_t w = ::write(fd, p, n);
        if (w < 0) {
            if (errno == EINTR) continue;
            return errno;
        }
        if (w == 0) return EIO;
        p += w;
        n -= static_cast<std::size_t>(w);
    }
    return 0;
}

fd_writer::fd_writer(int fd) : fd_(fd), buffer_(1 << 16) { setp(buffer_.data(), buffer_.data() + buffer_.size()); }

bool fd_writer::write_all(const char* p, std::size_t n) {
    if (error_ != 0) return false;
    error_ = write_fully(fd_, p, n);
    return error_ == 0;
}

bool fd_writer::drain() {
    const std::size_t n = static_cast<std::size_t>(pptr() - pbase());
    setp(buffer_.data(), buffer_.data() + buffer_.size());
    return write_all(buffer_.data(), n);
}

fd_writer::int_type fd_writer::overflow(int_type ch) {
    if (!drain()) return traits_type::eof();
    if (traits_type::eq_int_type(ch, traits_type::eof())) return traits_type::not_eof(ch);
    *pptr() = traits_type::to_char_type(ch);
    pbump(1);
    return ch;
}

std::streamsize fd_writer::xsputn(const char* s, std::streamsize n) {
    if (n <= epptr() - pptr()) {
        std::copy(s, s + n, pptr());
        pbump(static_cast<int>(n));
        return n;
    }
    if (!drain() || !write_all(s, static_cast<std::size_t>(n))) return 0;
    return n;
}

int fd_writer::sync() { return drain() ? 0 : -1; }

}  // namespace tipgap::detail
