#include "tipgap/core/key_names.hpp"

namespace tipgap {

std::string_view name_for(std::span<const key_name> table, std::string_view scope, std::string_view key) {
    for (const key_name& k : table)
        if (k.scope == scope && k.key == key) return k.name;
    for (const key_name& k : table)
        if (k.scope.empty() && k.key == key) return k.name;
    return {};
}

}  // namespace tipgap
