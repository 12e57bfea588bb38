// atomic_output under a SIGKILL in the middle of writing: the old file survives byte for byte, and
// the only trace is the hidden temporary ".<name>.tmp-<pid>-<n>". (tests/cli/atomic_output.sh kills
// whole commands at random moments; this kills a writer deterministically half-way.)
#include <gtest/gtest.h>

#include <csignal>
#include <filesystem>
#include <fstream>
#include <regex>
#include <sstream>
#include <string>
#include <vector>
#include <sys/wait.h>
#include <unistd.h>

#include "tipgap/io/atomic_directory.hpp"
#include "tipgap/io/atomic_file.hpp"

namespace fs = std::filesystem;

namespace {

std::string read_all(const fs::path& p) {
    std::ifstream in(p, std::ios::binary);
    std::ostringstream ss;
    ss << in.rdbuf();
    return ss.str();
}

struct scratch_dir {
    fs::path path;
    scratch_dir() {
        path = fs::temp_directory_path() / ("tipgap-atomic-" + std::to_string(::getpid()));
        fs::remove_all(path);
        fs::create_directories(path);
    }
    ~scratch_dir() { fs::remove_all(path); }
};

// Forks a writer that streams `bytes` bytes into an atomic_output on `target`, commits only when
// `commit` is set, and then kills itself with SIGKILL (no destructors, no cleanup).
pid_t killed_writer(const fs::path& target, std::size_t bytes, bool commit) {
    const pid_t pid = ::fork();
    if (pid == 0) {
        tipgap::atomic_output out(target.string());
        const std::string chunk(4096, 'n');
        for (std::size_t done = 0; done < bytes; done += chunk.size()) out.stream() << chunk;
        out.stream().flush();
        if (commit) out.commit();
        ::raise(SIGKILL);
        ::_exit(0);  // not reached
    }
    int status = 0;
    ::waitpid(pid, &status, 0);
    EXPECT_TRUE(WIFSIGNALED(status) && WTERMSIG(status) == SIGKILL);
    return pid;
}

}  // namespace

TEST(atomic_file, killed_mid_write_leaves_the_old_file_and_a_hidden_temporary) {
    scratch_dir dir;
    const fs::path target = dir.path / "result.csv";
    const std::string old = "gap_nm,bias_V\n0.6,0.1\n";
    tipgap::write_file_atomically(target.string(), old);

    const pid_t pid = killed_writer(target, 1 << 20, false);
    EXPECT_EQ(read_all(target), old);
    int others = 0;
    const std::regex temporary("\\.result\\.csv\\.tmp-" + std::to_string(pid) + "-[0-9]+");
    for (const auto& e : fs::directory_iterator(dir.path)) {
        const std::string name = e.path().filename().string();
        if (name == "result.csv") continue;
        ++others;
        EXPECT_TRUE(std::regex_match(name, temporary)) << name;
        EXPECT_EQ(fs::file_size(e.path()), std::uintmax_t{1} << 20);  // the half-written data, hidden
    }
    EXPECT_EQ(others, 1);
}

TEST(atomic_file, killed_after_commit_leaves_the_whole_new_file) {
    scratch_dir dir;
    const fs::path target = dir.path / "result.csv";
    tipgap::write_file_atomically(target.string(), "old\n");
    killed_writer(target, 1 << 16, true);
    EXPECT_EQ(read_all(target), std::string(1 << 16, 'n'));
    EXPECT_EQ(std::distance(fs::directory_iterator(dir.path), fs::directory_iterator{}), 1);
}

TEST(atomic_file, killed_mid_write_without_an_old_file_leaves_no_target) {
    scratch_dir dir;
    const fs::path target = dir.path / "fresh.json";
    killed_writer(target, 1 << 16, false);
    EXPECT_FALSE(fs::exists(target));
}

// The output directory of a report (`demo --out`, the grid `map`): a writer killed half-way leaves
// no directory under the target's name, and a committed one replaces an old directory whole.
TEST(atomic_file, killed_directory_writer_leaves_no_partial_directory) {
    scratch_dir dir;
    const fs::path target = dir.path / "report";
    const pid_t pid = ::fork();
    if (pid == 0) {
        tipgap::atomic_directory out(target.string(), {"a.csv"});
        tipgap::write_file_atomically(out.file("a.csv"), "1\n");
        ::raise(SIGKILL);
        ::_exit(0);
    }
    int status = 0;
    ::waitpid(pid, &status, 0);
    ASSERT_TRUE(WIFSIGNALED(status));
    EXPECT_FALSE(fs::exists(target));
    for (const auto& e : fs::directory_iterator(dir.path)) {
        EXPECT_TRUE(std::regex_match(e.path().filename().string(),
                                     std::regex("\\.report\\.tmp-" + std::to_string(pid) + "-[0-9]+")))
            << e.path();
    }
}

TEST(atomic_file, committed_directory_replaces_the_old_one_whole) {
    scratch_dir dir;
    const fs::path target = dir.path / "report";
    fs::create_directories(target);
    tipgap::write_file_atomically((target / "old.csv").string(), "old\n");
    {
        tipgap::atomic_directory out(target.string(), {"old.csv", "new.csv"});
        tipgap::write_file_atomically(out.file("new.csv"), "new\n");
        EXPECT_TRUE(fs::exists(target / "old.csv"));  // untouched until commit
        out.commit();
    }
    EXPECT_FALSE(fs::exists(target / "old.csv"));
    EXPECT_EQ(read_all(target / "new.csv"), "new\n");
    EXPECT_EQ(std::distance(fs::directory_iterator(dir.path), fs::directory_iterator{}), 1);
    {
        tipgap::atomic_directory abandoned(target.string(), {"new.csv", "x.csv"});  // destroyed without commit
        tipgap::write_file_atomically(abandoned.file("x.csv"), "x\n");
    }
    EXPECT_EQ(read_all(target / "new.csv"), "new\n");
    EXPECT_EQ(std::distance(fs::directory_iterator(dir.path), fs::directory_iterator{}), 1);
}
