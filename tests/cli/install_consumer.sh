#!/usr/bin/env bash
# `cmake --install` gives a package another CMake project can find_package(tipgap) and link:
# install into a temporary prefix, build a tiny consumer against it, run it. The consumer includes
# the umbrella header with only tipgap's include directory, warnings on: every public header
# compiles without Boost, Eigen, fmt, yaml-cpp or PLplot (those are linked PRIVATE).
set -euo pipefail
T="${TIPGAP:?}"
build=$(cd "$(dirname "$T")/.." && pwd)
tmp=$(mktemp -d); trap 'rm -rf "$tmp"' EXIT
cmake --install "$build" --prefix "$tmp/prefix" > "$tmp/install.log"
[ -x "$tmp/prefix/bin/tipgap" ] || { echo "FAIL: tipgap not installed"; exit 1; }
mkdir -p "$tmp/consumer"
cat > "$tmp/consumer/CMakeLists.txt" <<'CM'
cmake_minimum_required(VERSION 3.25)
project(consumer LANGUAGES CXX)
set(CMAKE_CXX_STANDARD 20)
find_package(tipgap REQUIRED)
add_executable(consumer main.cpp)
target_link_libraries(consumer PRIVATE tipgap::core)
target_compile_options(consumer PRIVATE -Wall -Wextra -Wpedantic)
CM
cat > "$tmp/consumer/main.cpp" <<'CPP'
#include <cstdio>
#include "tipgap/tipgap.hpp"
#include "tipgap/config/config.hpp"
#include "tipgap/model/current.hpp"
int main() {
    auto c = tipgap::default_config();
    double j = tipgap::current_density(c.model, 0.6e-9, 0.1);
    std::printf("%.6e\n", j);
    return j > 0 ? 0 : 1;
}
CPP
cmake -S "$tmp/consumer" -B "$tmp/consumer/build" -DCMAKE_PREFIX_PATH="$tmp/prefix" -DCMAKE_BUILD_TYPE=Release > "$tmp/cfg.log"
cmake --build "$tmp/consumer/build" -j 2 > "$tmp/build.log"
got=$("$tmp/consumer/build/consumer")
want=$("$T" predict --gap 0.6nm --bias 0.1V --format csv | tail -1 | cut -d, -f4)
/usr/bin/python3 -c "import sys; a,b=float('$got'),float('$want'); sys.exit(0 if abs(a/b-1)<1e-6 else 1)" \
  || { echo "FAIL: consumer J $got vs predict $want"; exit 1; }
echo "1 passed, 0 failed"
