# chute: the two README commands (make demo, make test), the benchmark and
# the soak (the reliability tests at their full counts).
# Each target installs the Debian packages it needs when they are missing
# (apt-get update first; sudo when not root), configures with CMake, builds
# and runs.

BUILD_DIR        ?= build
JOBS             ?= 2
CMAKE_BUILD_TYPE ?= RelWithDebInfo
CMAKE_EXTRA_FLAGS ?=

BUILD_PACKAGES = cmake g++ make pkg-config libicu-dev libsqlite3-dev \
                 libcli11-dev libgtest-dev libgmock-dev libssl-dev libcsv-dev \
                 libxml2-dev python3 nlohmann-json3-dev libzstd-dev
# Outside references used by the tests (see README, "How chute is checked").
TEST_PACKAGES  = python3-sklearn unicode-data r-cran-tm groff-base manpages \
                 manpages-dev python3-lxml chromium python3-statsmodels
BENCH_PACKAGES = libbenchmark-dev python3-sklearn time

SUDO := $(shell [ "$$(id -u)" = 0 ] || echo sudo)

# Installs the packages in $(1) that dpkg does not report as installed.
define install_missing
	@missing=""; for p in $(1); do \
	  dpkg-query -W -f='$${Status}' $$p 2>/dev/null | grep -q "ok installed" || missing="$$missing $$p"; \
	done; \
	if [ -n "$$missing" ]; then \
	  echo "installing:$$missing"; \
	  $(SUDO) apt-get update -qq && \
	  DEBIAN_FRONTEND=noninteractive $(SUDO) apt-get install -y -qq --no-install-recommends $$missing >/dev/null; \
	fi
endef

.PHONY: all deps test-deps bench-deps configure build demo test bench soak clean

all: build

deps:
	$(call install_missing,$(BUILD_PACKAGES))

test-deps: deps
	$(call install_missing,$(TEST_PACKAGES))

bench-deps: deps
	$(call install_missing,$(BENCH_PACKAGES))

configure:
	cmake -S . -B $(BUILD_DIR) -DCMAKE_BUILD_TYPE=$(CMAKE_BUILD_TYPE) $(CMAKE_EXTRA_FLAGS)

build: deps configure
	cmake --build $(BUILD_DIR) -j $(JOBS)

demo: deps configure
	cmake --build $(BUILD_DIR) -j $(JOBS) --target chute
	@corpora/demo.sh $(BUILD_DIR)/chute

test: test-deps configure
	cmake --build $(BUILD_DIR) -j $(JOBS)
	cd $(BUILD_DIR) && ctest --output-on-failure -j $(JOBS)

bench: bench-deps
	cmake -S . -B $(BUILD_DIR) -DCMAKE_BUILD_TYPE=Release -DCHUTE_BENCH=ON $(CMAKE_EXTRA_FLAGS)
	cmake --build $(BUILD_DIR) -j $(JOBS)
	tests/bench/run.sh $(BUILD_DIR)
	tests/bench/reviewer_loop.sh $(BUILD_DIR)
	tests/bench/route_into.sh $(BUILD_DIR)
	/usr/bin/python3 tests/bench/watch_vs_route.py $(BUILD_DIR)

# The reliability tests of make test (label "reliability") at their full
# counts: 50 random kills; 120 corrections and 120 learns under four routers;
# 100 killed deliveries of 500 documents (route --into --move).
# chute watch under a burst of 10,000 files.
soak: deps configure
	cmake --build $(BUILD_DIR) -j $(JOBS) --target chute
	/usr/bin/python3 tests/e2e/crash_test.py $(BUILD_DIR)/chute --full
	/usr/bin/python3 tests/e2e/concurrency_test.py $(BUILD_DIR)/chute --full
	/usr/bin/python3 tests/e2e/delivery_kill_test.py $(BUILD_DIR)/chute --full
	/usr/bin/python3 tests/e2e/watch_test.py $(BUILD_DIR)/chute --full

clean:
	rm -rf $(BUILD_DIR)
