// Checked writes (issue 11, class 2): a full device is reported with its errno, never lost in a
// stream flag; an atomic_output on a full disk is tested in tests/cli/hostile_outputs.sh (tmpfs).
#include <gtest/gtest.h>

#include <cerrno>
#include <fcntl.h>
#include <ostream>
#include <string>
#include <unistd.h>

#include "io/detail/fd_writer.hpp"

TEST(fd_writer, a_full_device_reports_enospc) {
    const int fd = ::open("/dev/full", O_WRONLY | O_CLOEXEC);
    if (fd < 0) GTEST_SKIP() << "no /dev/full";
    tipgap::detail::fd_writer buf(fd);
    std::ostream out(&buf);
    out << std::string(100000, 'x');
    out.flush();
    EXPECT_FALSE(static_cast<bool>(out));
    EXPECT_EQ(buf.error(), ENOSPC);
    ::close(fd);
}

TEST(fd_writer, every_byte_reaches_a_pipe) {
    int p[2];
    ASSERT_EQ(::pipe(p), 0);
    tipgap::detail::fd_writer buf(p[1]);
    std::ostream out(&buf);
    const std::string text(30000, 'y');  // below the pipe's capacity, larger than one write() of some kernels
    out << text << '\n';
    out.flush();
    ::close(p[1]);
    EXPECT_EQ(buf.error(), 0);
    std::string got;
    char chunk[4096];
    for (ssize_t n; (n = ::read(p[0], chunk, sizeof chunk)) > 0;) got.append(chunk, static_cast<std::size_t>(n));
    ::close(p[0]);
    EXPECT_EQ(got, text + "\n");
}
