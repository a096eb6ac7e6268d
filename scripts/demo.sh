#!/usr/bin/env bash
# Builds lode, indexes the bundled sample corpus and runs a sample search with
# its per-term breakdown. The index is written to build/sample.sqlite.
set -euo pipefail
cd "$(dirname "$0")/.."
cmake -S . -B build -DCMAKE_BUILD_TYPE=RelWithDebInfo >/dev/null
cmake --build build -j"${JOBS:-2}" --target lode
./build/lode --index build/sample.sqlite index sample_corpus/archive
./build/lode --index build/sample.sqlite search --why --top 3 "${1:-storm damage at the jetty}"
