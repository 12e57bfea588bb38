// Output paths and the run's all-or-nothing outputs (issue 11, class 1 and 3): links written
// through, special files and inputs refused, one transaction commits every output or none, stale
// temporaries of dead processes removed.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include "tipgap/core/error.hpp"
#include "tipgap/io/atomic_file.hpp"
#include "tipgap/io/output_path.hpp"
#include "tipgap/io/output_transaction.hpp"

namespace fs = std::filesystem;
using namespace tipgap;

namespace {

std::string read_all(const fs::path& p) {
    std::ifstream in(p, std::ios::binary);
    std::ostringstream ss;
    ss << in.rdbuf();
    return ss.str();
}

struct scratch {
    fs::path dir = fs::temp_directory_path() / ("tipgap-output-path-" + std::to_string(::getpid()));
    scratch() {
        fs::remove_all(dir);
        fs::create_directories(dir);
    }
    ~scratch() { fs::remove_all(dir); }
    std::string operator/(const char* name) const { return (dir / name).string(); }
};

std::string message_of(const std::function<void()>& f) {
    try {
        f();
    } catch (const error& e) {
        return e.what();
    }
    return "";
}

}  // namespace

TEST(output_path, symbolic_link_is_written_through) {
    scratch s;
    std::ofstream(s / "target.csv") << "old";
    fs::create_symlink("target.csv", s / "link.csv");
    EXPECT_EQ(output_target(s / "link.csv"), s / "target.csv");
    write_file_atomically(s / "link.csv", "new");
    EXPECT_TRUE(fs::is_symlink(s / "link.csv"));
    EXPECT_EQ(read_all(s / "target.csv"), "new");
}

TEST(output_path, special_files_and_directories_are_refused) {
    scratch s;
    ASSERT_EQ(::mkfifo((s / "fifo").c_str(), 0600), 0);
    EXPECT_NE(message_of([&] { output_target(s / "fifo"); }).find("not a regular file"), std::string::npos);
    EXPECT_NE(message_of([&] { output_target(s.dir.string()); }).find("is a directory"), std::string::npos);
    EXPECT_NE(message_of([] { output_target("/dev/null"); }).find("standard output"), std::string::npos);
    EXPECT_NE(message_of([] { output_target("/dev/stdout"); }).find("standard output"), std::string::npos);
    EXPECT_TRUE(fs::is_fifo(s / "fifo"));
}

TEST(output_path, an_input_or_a_repeated_output_is_refused_before_work) {
    scratch s;
    std::ofstream(s / "v.csv") << "data";
    fs::create_symlink("v.csv", s / "alias.csv");
    EXPECT_NE(message_of([&] { check_run_paths({s / "v.csv"}, {{s / "alias.csv", false}}); }).find("also an input"),
              std::string::npos);
    EXPECT_NE(message_of([&] { check_run_paths({}, {{s / "a.csv", false}, {s / "a.csv", false}}); }).find("two outputs"),
              std::string::npos);
    EXPECT_EQ(message_of([&] { check_run_paths({s / "v.csv"}, {{s / "a.csv", false}, {s / "b.csv", false}}); }), "");
    EXPECT_EQ(read_all(s / "v.csv"), "data");
}

TEST(output_transaction, commits_every_output_or_none) {
    scratch s;
    {
        output_transaction t;
        write_file_atomically(s / "a.csv", "a");
        write_file_atomically(s / "b.csv", "b");
        EXPECT_FALSE(fs::exists(s / "a.csv"));  // nothing in place before the commit
        // a second write to one path in the same run is refused
        EXPECT_NE(message_of([&] { write_file_atomically(s / "a.csv", "again"); }).find("written twice"), std::string::npos);
    }  // no commit: a failed run
    EXPECT_TRUE(fs::is_empty(s.dir));
    {
        output_transaction t;
        write_file_atomically(s / "a.csv", "a");
        write_file_atomically(s / "b.csv", "b");
        t.commit();
    }
    EXPECT_EQ(read_all(s / "a.csv"), "a");
    EXPECT_EQ(read_all(s / "b.csv"), "b");
    EXPECT_EQ(std::distance(fs::directory_iterator(s.dir), fs::directory_iterator()), 2);
}

TEST(output_path, stale_temporaries_of_dead_processes_are_removed) {
    scratch s;
    const pid_t child = ::fork();
    if (child == 0) ::_exit(0);
    ASSERT_GT(child, 0);
    ::waitpid(child, nullptr, 0);  // now a pid without a process
    const std::string dead = s / ("." + std::string("r.csv") + ".tmp-" + std::to_string(child) + "-0").c_str();
    const std::string live = s / ("." + std::string("r.csv") + ".tmp-" + std::to_string(::getppid()) + "-0").c_str();
    std::ofstream(dead) << "partial";
    std::ofstream(live) << "partial";
    std::ofstream(s / ".r.csv.tmp-notes") << "not a temporary name";
    std::ofstream(s / ".r.csv.tmp-99999999999999999999-0") << "a number beyond any pid";
    remove_stale_temporaries(s / "r.csv");
    EXPECT_FALSE(fs::exists(dead));
    EXPECT_TRUE(fs::exists(live));
    EXPECT_TRUE(fs::exists(s / ".r.csv.tmp-notes"));
    EXPECT_TRUE(fs::exists(s / ".r.csv.tmp-99999999999999999999-0"));
}
