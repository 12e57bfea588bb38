// atomic_directory: a command's output directory appears whole or not at all, and never replaces
// files it did not write.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "support/temp_dir.hpp"
#include "tipgap/io/atomic_directory.hpp"

namespace {

namespace fs = std::filesystem;
using namespace tipgap;
using namespace tipgap_test;

TEST(atomic_directory, replaces_an_earlier_output_but_never_foreign_files) {
    temp_dir d;
    const std::string target = (d.path() / "out").string();
    {
        atomic_directory a(target, {"a.txt", "b.txt"});
        std::ofstream(a.file("a.txt")) << "first";
        EXPECT_FALSE(fs::exists(target));  // nothing visible before commit
        a.commit();
    }
    EXPECT_TRUE(fs::exists(fs::path(target) / "a.txt"));
    {
        atomic_directory a(target, {"a.txt", "b.txt"});
        std::ofstream(a.file("b.txt")) << "second";
        a.commit();
    }
    EXPECT_FALSE(fs::exists(fs::path(target) / "a.txt"));  // replaced whole
    EXPECT_TRUE(fs::exists(fs::path(target) / "b.txt"));
    {
        atomic_directory a(target, {"a.txt", "b.txt"});
        std::ofstream(a.file("a.txt")) << "abandoned";
    }  // not committed: the old output stays, no temporary is left
    EXPECT_TRUE(fs::exists(fs::path(target) / "b.txt"));
    std::size_t entries = 0;
    for (const auto& e : fs::directory_iterator(d.path())) entries += e.path().filename() != "out";
    EXPECT_EQ(entries, 0u);
    std::ofstream((fs::path(target) / "notes.txt").string()) << "mine";
    EXPECT_EQ(error_of([&] { atomic_directory a(target, {"a.txt", "b.txt"}); }),
              target + ": exists and holds 'notes.txt', which this command does not write; it replaces only an empty "
                       "directory or its own earlier output. Remove it or choose another directory");
}

}  // namespace
