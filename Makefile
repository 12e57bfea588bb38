# Thin wrapper for the README's two commands. Everything real lives in CMake.
#   make demo   install missing Debian packages, build the library, the executable and the Python
#               module (Release; no tests, benchmarks or fuzzers), run `tipgap demo`
#   make check  install missing Debian packages, then
#               1. Release build + the whole ctest suite,
#               2. ASan+UBSan build (build-asan/) + the ctest suite without the SciPy cross-checks,
#               3. the libFuzzer targets (build-fuzz/, clang) for FUZZ_SECONDS each.
#               `make check-release`, `make check-sanitize` and `make fuzz` run one step alone.
BUILD ?= build
SAN_BUILD ?= build-asan
FUZZ_SECONDS ?= 60
# The sanitizer run reads 64 MiB lines instead of 1 GiB ones in tests/bad_inputs (ASan's shadow
# memory and slower scanning make the full size cost minutes, and the code path is the same).
SAN_LONG_LINE_BYTES ?= 67108864
# Not run under the sanitizers: the SciPy cross-checks (the same binary's numbers, checked in the
# Release step; minutes under ASan) and the install test (an outside project cannot link an
# ASan-instrumented static library without the sanitizer runtime).
# -O1 -g1 compiles the sanitizer build much faster than -O2 -g and keeps function names and line
# tables in the reports; the numbers are the same (no -ffast-math, no FMA contraction on x86-64).
SAN_OPT_FLAGS ?= -O1 -g1 -DNDEBUG
SAN_EXCLUDE ?= ^scipy\.|^cli\.install_consumer$$
JOBS ?= $(shell nproc)
DEMO_OUT ?= tipgap-demo
DEBIAN_PACKAGES = cmake g++ make pkg-config libboost-math-dev libeigen3-dev libyaml-cpp-dev \
  libgtest-dev libgmock-dev libcli11-dev libfmt-dev nlohmann-json3-dev libplplot-dev plplot-driver-cairo zlib1g-dev \
  libbenchmark-dev python3 python3-numpy python3-scipy clang libclang-rt-14-dev time \
  pybind11-dev python3-dev python3-pytest

.PHONY: deps configure build demo check check-release check-sanitize fuzz

deps:
	@missing=""; for p in $(DEBIAN_PACKAGES); do \
	  dpkg-query -W -f='$${Status}' $$p 2>/dev/null | grep -q "install ok installed" || missing="$$missing $$p"; \
	done; \
	if [ -n "$$missing" ]; then \
	  echo "Installing missing Debian packages:$$missing"; \
	  if [ "$$(id -u)" -eq 0 ]; then SUDO=""; else SUDO="sudo"; fi; \
	  $$SUDO apt-get update && DEBIAN_FRONTEND=noninteractive $$SUDO apt-get install -y $$missing; \
	fi

# One build tree for both commands: `make demo` builds only the `tipgap` executable and the Python
# module `tipgap_python` (and the library they link), `make check` then builds the rest in the same
# tree without recompiling the library.
configure: deps
	cmake -S . -B $(BUILD) -DCMAKE_BUILD_TYPE=Release

build: configure
	cmake --build $(BUILD) -j $(JOBS)

demo: configure
	cmake --build $(BUILD) -j $(JOBS) --target tipgap tipgap_python
	$(BUILD)/cli/tipgap demo --out $(DEMO_OUT)

# In this order even under `make -j`: a failing Release suite stops before the slower steps.
check:
	$(MAKE) check-release
	$(MAKE) check-sanitize
	$(MAKE) fuzz

check-release: build
	ctest --test-dir $(BUILD) --output-on-failure -j $(JOBS)

check-sanitize: deps
	cmake -S . -B $(SAN_BUILD) -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCMAKE_CXX_FLAGS_RELWITHDEBINFO="$(SAN_OPT_FLAGS)" \
	  -DTIPGAP_SANITIZE=ON -DTIPGAP_BUILD_BENCH=OFF -DTIPGAP_PYTHON=OFF
	cmake --build $(SAN_BUILD) -j $(JOBS)
	ASAN_OPTIONS=detect_leaks=1:abort_on_error=1 UBSAN_OPTIONS=print_stacktrace=1:halt_on_error=1 \
	  LSAN_OPTIONS=suppressions=$(CURDIR)/tests/sanitizer/lsan.supp:print_suppressions=0 \
	  TIPGAP_LONG_LINE_BYTES=$(SAN_LONG_LINE_BYTES) \
	  ctest --test-dir $(SAN_BUILD) --output-on-failure -j $(JOBS) -E '$(SAN_EXCLUDE)'

fuzz: deps
	FUZZ_SECONDS=$(FUZZ_SECONDS) FUZZ_JOBS=$(JOBS) tests/fuzz/run_fuzzers.sh
