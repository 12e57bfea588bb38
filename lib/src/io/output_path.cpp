// Output paths: links written through, special files refused, inputs protected (output_path.hpp).
#include "tipgap/io/output_path.hpp"

#include <cerrno>
#include <csignal>
#include <filesystem>
#include <fmt/format.h>
#include <sys/stat.h>
#include <unistd.h>

#include "tipgap/core/error.hpp"
#include "tipgap/io/output_transaction.hpp"

namespace tipgap {
namespace fs = std::filesystem;

namespace {

[[noreturn]] void refuse(const std::string& path, const std::string& what) {
    throw_input(location{path, 0, 0, ""}, what);
}

// Follows a chain of symbolic links to the path it ends at (which need not exist).
fs::path follow_links(const std::string& user_path) {
    fs::path p = user_path;
    for (int depth = 0; depth < 40; ++depth) {
        std::error_code ec;
        if (!fs::is_symlink(fs::symlink_status(p, ec))) return p;
        const fs::path next = fs::read_symlink(p, ec);
        if (ec) refuse(user_path, fmt::format("cannot read the symbolic link: {}", ec.message()));
        p = next.is_absolute() ? next : p.parent_path() / next;
    }
    refuse(user_path, "too many levels of symbolic links");
}

bool starts_dir(const std::string& s, const char* dir) {
    const std::size_t n = std::char_traits<char>::length(dir);
    return s.compare(0, n, dir) == 0 && (s.size() == n || s[n] == '/');
}

// True when p, as written or with its links resolved, lies in dir.
bool under(const fs::path& p, const char* dir) {
    std::error_code ec;
    const fs::path abs = fs::absolute(p, ec);
    if (starts_dir(abs.lexically_normal().string(), dir)) return true;
    const fs::path real = fs::weakly_canonical(abs, ec);
    return !ec && starts_dir(real.string(), dir);
}

// A key that names a file whatever path leads to it: device and inode when it exists, else the
// resolved path.
std::string identity(const std::string& path) {
    struct stat st {};
    if (::stat(path.c_str(), &st) == 0) return fmt::format("inode {}:{}", st.st_dev, st.st_ino);
    std::error_code ec;
    const fs::path p = fs::weakly_canonical(fs::absolute(path), ec);
    return "path " + (ec ? path : p.string());
}

// The checks of output_target that need no transaction.
std::string checked_target(const std::string& path) {
    if (path.empty() || path == "-") refuse(path, "no output file named; write '-' for standard output");
    if (under(path, "/dev") || under(path, "/proc"))
        refuse(path, "is a device or process file; write '-' (or leave the option out) for standard output, or name a "
                     "regular file");
    const fs::path target = follow_links(path);
    std::error_code ec;
    const fs::file_status st = fs::status(target, ec);
    if (fs::is_directory(st)) refuse(path, "is a directory; expected a file name");
    if (fs::exists(st) && !fs::is_regular_file(st))
        refuse(path, "is not a regular file (a FIFO, socket or device); tipgap replaces only regular files");
    return target.string();
}

}  // namespace

std::string output_target(const std::string& path) {
    const std::string target = checked_target(path);
    output_transaction* t = current_output_transaction();
    if (!t) return target;
    const std::string id = identity(target);
    for (const std::string& in : t->inputs_)
        if (identity(in) == id) refuse(path, "is also an input of this command; choose another output file");
    for (const std::string& other : t->targets_)
        if (identity(other) == id) refuse(path, "is written twice by this command; give each output its own file");
    t->targets_.push_back(target);
    return target;
}

void check_run_paths(const std::vector<std::string>& inputs, const std::vector<run_output>& outputs) {
    std::vector<std::string> seen;
    for (const run_output& o : outputs) {
        if (o.path.empty() || o.path == "-") continue;
        const std::string target = o.directory ? o.path : checked_target(o.path);
        const std::string id = identity(target);
        for (const std::string& in : inputs) {
            if (in.empty() || in == "-" || !fs::exists(in)) continue;
            if (identity(in) == id) refuse(o.path, fmt::format("is also an input of this command ({}); choose another output",
                                                             quote_input(in)));
            if (o.directory && fs::is_directory(target) && under(in, fs::weakly_canonical(target).c_str()))
                refuse(o.path, fmt::format("would replace a directory holding the input {}; choose another output directory",
                                           quote_input(in)));
        }
        for (const std::string& s : seen)
            if (s == id) refuse(o.path, "is named for two outputs of this command; give each output its own path");
        seen.push_back(id);
    }
}

void remove_stale_temporaries(const std::string& target) {
    const fs::path t = fs::path(target);
    const std::string prefix = "." + t.filename().string() + ".tmp-";
    const fs::path dir = t.parent_path().empty() ? fs::path(".") : t.parent_path();
    std::error_code ec;
    for (const fs::directory_entry& e : fs::directory_iterator(dir, ec)) {
        const std::string name = e.path().filename().string();
        if (name.compare(0, prefix.size(), prefix) != 0) continue;
        const std::string rest = name.substr(prefix.size());  // "<pid>-<n>"
        const std::size_t dash = rest.find('-');
        // pids fit in 9 digits on Linux (pid_max <= 4194304); a longer number is not our name.
        if (dash == 0 || dash > 9 || dash == std::string::npos || rest.find_first_not_of("0123456789-") != std::string::npos)
            continue;
        const long pid = std::stol(rest.substr(0, dash));
        if (pid <= 0 || pid == static_cast<long>(::getpid())) continue;
        if (::kill(static_cast<pid_t>(pid), 0) == 0 || errno != ESRCH) continue;  // alive, or not ours to judge
        std::error_code rm;
        fs::remove_all(e.path(), rm);
    }
}

}  // namespace tipgap
