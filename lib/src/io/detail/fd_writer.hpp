#pragma once
// A std::streambuf on a file descriptor that checks every write(2): it retries short writes and
// EINTR and remembers the first errno, so that a full disk is reported, not lost in a stream flag.
#include <streambuf>
#include <vector>

namespace tipgap::detail {

class fd_writer : public std::streambuf {
public:
    explicit fd_writer(int fd);
    // 0 while every write succeeded, else the first errno.
    int error() const { return error_; }

protected:
    int_type overflow(int_type ch) override;
    std::streamsize xsputn(const char* s, std::streamsize n) override;
    int sync() override;

private:
    bool write_all(const char* p, std::size_t n);
    bool drain();
    int fd_;
    int error_ = 0;
    std::vector<char> buffer_;
};

// Writes all n bytes of p to fd (retrying short writes and EINTR); returns 0 or the errno.
int write_fully(int fd, const char* p, std::size_t n);

}  // namespace tipgap::detail
