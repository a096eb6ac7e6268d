#!/usr/bin/env bash
# Builds lode and runs every test (CTest over the doctest suites).
# Environment: BUILD_DIR (default build), JOBS (default 2), CI=true adds -Werror,
# LODE_SANITIZE="address;undefined" builds with sanitizers.
set -euo pipefail
cd "$(dirname "$0")/.."
build=${BUILD_DIR:-build}
jobs=${JOBS:-2}
werror=OFF
if [ "${CI:-}" = "true" ]; then werror=ON; fi
cmake -S . -B "$build" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DLODE_WERROR=$werror \
  -DLODE_SANITIZE="${LODE_SANITIZE:-}" -DLODE_BUILD_BENCHMARKS=ON
cmake --build "$build" -j"$jobs"
ctest --test-dir "$build" --output-on-failure -j"$jobs" --timeout 600
