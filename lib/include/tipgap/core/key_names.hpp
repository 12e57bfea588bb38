#pragma once
// Tables that map the library's neutral keys (what its checks name: "gap", "noise_floor_A",
// "tip.work_function") to what a front end calls them: a command-line flag (cli/flags.cpp) or a
// Python keyword (lib/python/src/keywords.cpp). One lookup for both.
#include <span>
#include <string_view>

namespace tipgap {

struct key_name {
    std::string_view scope;  // the command or function the row is for; "" : every one
    std::string_view key;    // the library's key
    std::string_view name;   // the front end's name for it
};

// The name of `key` in `scope`: the scope's own row first, then a row for every scope; "" when the
// table has neither.
std::string_view name_for(std::span<const key_name> table, std::string_view scope, std::string_view key);

}  // namespace tipgap
