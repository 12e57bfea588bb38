#!/usr/bin/env bash
# Builds the libFuzzer targets in build-fuzz/ (clang, ASan + UBSan) and runs each for a bounded
# time on its seed corpus (tests/fuzz/seeds/<target>/ plus the matching part of tests/bad_inputs/).
# Exit status 0 only when every fuzzer ran its whole budget without a finding.
#
# Usage: tests/fuzz/run_fuzzers.sh [seconds per target]     (default 60, or $FUZZ_SECONDS)
# Env:   FUZZ_SEED (libFuzzer -seed, default 1), FUZZ_BUILD (default build-fuzz), FUZZ_JOBS (build jobs, default 2), FUZZ_TARGETS (default
#        "fuzz_quantity fuzz_config fuzz_curve_csv fuzz_grid_csv").
# A finding leaves its input in $FUZZ_BUILD/artifacts/<target>-crash-* (reproduce with
# `$FUZZ_BUILD/tests/fuzz/<target> <file>`); fix it and add the input to tests/bad_inputs/ (with a
# cases.tsv row) or to tests/fuzz/seeds/<target>/.
set -euo pipefail
root="$(cd "$(dirname "$0")/../.." && pwd)"
seconds="${1:-${FUZZ_SECONDS:-60}}"
build="${FUZZ_BUILD:-build-fuzz}"
jobs="${FUZZ_JOBS:-2}"
targets="${FUZZ_TARGETS:-fuzz_quantity fuzz_config fuzz_curve_csv fuzz_grid_csv}"
# A fixed libFuzzer seed makes a CI run repeatable (the same inputs in the same order); set
# FUZZ_SEED=0 for a fresh random sequence when hunting.
seed="${FUZZ_SEED:-1}"
cd "$root"

mkdir -p "$build"
cmake -S . -B "$build" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCMAKE_CXX_COMPILER=clang++ \
  -DTIPGAP_FUZZ=ON -DTIPGAP_BUILD_TESTS=ON -DTIPGAP_BUILD_BENCH=OFF > "$build/configure.log" 2>&1 \
  || { cat "$build/configure.log"; exit 1; }
# Only the fuzz targets and what they link (not the test binary).
cmake --build "$build" -j "$jobs" --target $targets

mkdir -p "$build/artifacts"
# Stop at the first report; leaks count (the parsers must not leak on any input).
export ASAN_OPTIONS="${ASAN_OPTIONS:-abort_on_error=1:detect_leaks=1}"
export UBSAN_OPTIONS="${UBSAN_OPTIONS:-print_stacktrace=1:halt_on_error=1}"
status=0
for t in $targets; do
  case "$t" in
    fuzz_quantity) extra=(); dict=quantity; max_len=256 ;;
    fuzz_config) extra=("$root/tests/bad_inputs/config"); dict=config; max_len=4096 ;;
    fuzz_curve_csv) extra=("$root/tests/bad_inputs/csv"); dict=curve_csv; max_len=8192 ;;
    fuzz_grid_csv) extra=("$root/tests/bad_inputs/grid"); dict=curve_csv; max_len=16384 ;;
    *) extra=(); dict=""; max_len=4096 ;;
  esac
  seeds="$root/tests/fuzz/seeds/${t#fuzz_}"
  work="$build/corpus/$t"  # grows from run to run; new inputs go here, never into the source tree
  mkdir -p "$work"
  dict_opt=()
  [ -n "$dict" ] && [ -f "$root/tests/fuzz/$dict.dict" ] && dict_opt=("-dict=$root/tests/fuzz/$dict.dict")
  echo "== $t: ${seconds}s"
  set +e
  "$build/tests/fuzz/$t" -seed="$seed" -max_total_time="$seconds" -max_len="$max_len" -timeout=10 -rss_limit_mb=2048 \
    -print_final_stats=1 -artifact_prefix="$build/artifacts/$t-" "${dict_opt[@]}" \
    "$work" "$seeds" "${extra[@]}" > "$build/$t.log" 2>&1
  rc=$?
  set -e
  tail -n 12 "$build/$t.log" | grep -E "stat::number_of_executed_units|stat::peak_rss_mb|Done|ERROR|SUMMARY" || true
  if [ "$rc" -ne 0 ]; then
    echo "FAIL: $t exited with $rc; see $build/$t.log and $build/artifacts/" >&2
    grep -m 5 -E "ERROR|runtime error|SUMMARY|==[0-9]+==|deadly|Test unit written" "$build/$t.log" >&2 || true
    status=1
  fi
done
exit $status
