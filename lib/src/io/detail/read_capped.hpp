#pragma once
// Reading a whole text input with a size cap, so that a pipe, a device (/dev/zero) or a huge file
// given by mistake ends in a clear error instead of a hang or an exhausted memory.
#include <cstddef>
#include <string>

namespace tipgap::detail {

// Caps (README "Limits"): a configuration or options YAML is at most 1 MiB; a curve or trace read
// from a pipe or device at most 64 MiB (a regular curve file is read whatever its size).
constexpr std::size_t config_cap_bytes = std::size_t{1} << 20;
constexpr std::size_t stream_cap_bytes = std::size_t{64} << 20;

// The bytes of `path`. Refused (tipgap::error, input, naming path): a directory, an unreadable
// file, more than `cap` bytes (regular files are measured first, others are read up to cap + 1).
// regular_unlimited: a regular file may be of any size. what: "a configuration", "a curve file".
std::string read_capped(const std::string& path, std::size_t cap, bool regular_unlimited, const char* what);

}  // namespace tipgap::detail
