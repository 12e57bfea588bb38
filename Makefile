# Thin wrapper for the README's two commands. Everything real lives in CMake.
#   make demo   install missing Debian packages, build (Release), run `tipgap demo`
#   make check  install missing Debian packages, build, run the whole test suite (ctest)
BUILD ?= build
JOBS ?= $(shell nproc)
DEMO_OUT ?= tipgap-demo
DEBIAN_PACKAGES = cmake g++ make pkg-config libboost-math-dev libeigen3-dev libyaml-cpp-dev \
  libgtest-dev libgmock-dev libcli11-dev libfmt-dev nlohmann-json3-dev libplplot-dev plplot-driver-cairo \
  libbenchmark-dev python3 python3-numpy python3-scipy clang libclang-rt-14-dev time

.PHONY: deps build demo check

deps:
	@missing=""; for p in $(DEBIAN_PACKAGES); do \
	  dpkg-query -W -f='$${Status}' $$p 2>/dev/null | grep -q "install ok installed" || missing="$$missing $$p"; \
	done; \
	if [ -n "$$missing" ]; then \
	  echo "Installing missing Debian packages:$$missing"; \
	  if [ "$$(id -u)" -eq 0 ]; then SUDO=""; else SUDO="sudo"; fi; \
	  $$SUDO apt-get update && DEBIAN_FRONTEND=noninteractive $$SUDO apt-get install -y $$missing; \
	fi

build: deps
	cmake -S . -B $(BUILD) -DCMAKE_BUILD_TYPE=Release
	cmake --build $(BUILD) -j $(JOBS)

demo: build
	$(BUILD)/cli/tipgap demo --out $(DEMO_OUT)

check: build
	ctest --test-dir $(BUILD) --output-on-failure -j $(JOBS)
