// bench/index_phases.h — the measured phases of bench_index, each meant to
// run alone in a fresh process (bench_index re-runs itself per phase) so peak
// RSS belongs to that phase only.
//
// Each returns a JSON object (fields listed in bench/README.md) or, on a
// library error, an object with an "error" string naming the file or step.
//
// Thread safety: single-threaded; one phase per process.
#pragma once

#include <cstddef>
#include <string>

#include <nlohmann/json.hpp>

namespace lode::bench {

// The naive baseline on the same files, no index: a warm-up pass, then
// (1) read: lode::read_file on every file (I/O from the page cache, content
//     hash, UTF-8 check, plain-text reader), and
// (2) read + analyze: the same plus lode::Analyzer::analyze over each
//     document's title and body, exactly as the index writer calls it.
// `repeat` runs each pass that many times and reports the fastest.
nlohmann::json baseline_phase(const std::string& corpus, int repeat);

// Full indexing of `corpus` into a fresh index at `index_path` (old files at
// that path are removed first) through lode::index_paths with a batch of
// `batch_mib` MiB: crawl, read, analyze, invert, flush, SQLite commits, and
// closing the writer (WAL checkpoint). Samples RSS during the run.
nlohmann::json index_phase(const std::string& corpus, const std::string& index_path, double batch_mib);

}  // namespace lode::bench
