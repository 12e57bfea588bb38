#pragma once
// Scratch directories and error messages for tests that write files (grid, io).
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <functional>
#include <string>
#include <system_error>
#include <unistd.h>

#include "tipgap/core/error.hpp"

namespace tipgap_test {

namespace fs = std::filesystem;

// A fresh directory under the system temp directory, removed with everything in it at scope end.
class temp_dir {
public:
    temp_dir() {
        static int n = 0;  // the constructor is inline: one counter for the whole test binary
        path_ = fs::temp_directory_path() / fmt::format("tipgap_grid_test_{}_{}", ::getpid(), n++);
        fs::create_directories(path_);
    }
    ~temp_dir() {
        std::error_code ec;
        fs::remove_all(path_, ec);
    }
    std::string file(const std::string& name, const std::string& content = "") const {
        const std::string p = (path_ / name).string();
        if (!content.empty()) std::ofstream(p, std::ios::binary) << content;
        return p;
    }
    const fs::path& path() const { return path_; }

private:
    fs::path path_;
};

// The message of the tipgap::error that f throws, or "(no error)".
inline std::string error_of(const std::function<void()>& f) {
    try {
        f();
    } catch (const tipgap::error& e) {
        return e.what();
    }
    return "(no error)";
}

}  // namespace tipgap_test
