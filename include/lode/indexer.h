// lode/indexer.h — bringing an index up to date with folders on disk.
//
// index_paths() crawls the roots, compares each file with what the index
// recorded (size and mtime first; the content hash when those differ), reads
// only new or changed files, removes files that disappeared from under a
// root, and commits. One unreadable file never stops the run: it is reported
// in IndexReport::problems and the file's previous version stays indexed.
//
// Thread safety: uses the given IndexWriter; one call at a time per writer.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "lode/index.h"
#include "lode/ingest.h"
#include "lode/status.h"

namespace lode {

struct IndexRunOptions {
  CrawlOptions crawl;
  ReadOptions read;
  // Remove indexed files under a root that the crawl no longer finds.
  bool remove_missing = true;
  // Polled between files; returning true commits what is done and stops.
  std::function<bool()> cancelled;
};

struct IndexProgress {
  std::size_t files_done = 0, files_total = 0;
  std::uint64_t bytes_done = 0, bytes_total = 0;
  std::string_view current;  // path being read
};

struct FileProblem {
  std::string path;
  std::string message;  // the error, naming the reason
};

struct IndexReport {
  std::size_t added = 0;      // files new to the index
  std::size_t updated = 0;    // files whose content changed
  std::size_t unchanged = 0;  // files skipped (same size+mtime, or same hash)
  std::size_t removed = 0;    // files gone from disk, removed from the index
  std::size_t failed = 0;     // files that could not be read (see problems)
  std::size_t documents = 0;  // documents added or replaced
  std::uint64_t bytes_read = 0;
  bool cancelled = false;
  std::vector<FileProblem> problems;  // failed files and crawl problems
  std::vector<FileProblem> warnings;  // files indexed with a warning (bad UTF-8, bad JSONL lines)
};

// Errors returned (as opposed to reported per file): a root that does not
// exist, and index write failures (after which nothing uncommitted is kept).
Result<IndexReport> index_paths(IndexWriter& writer, const std::vector<std::string>& roots,
                                const IndexRunOptions& options,
                                const std::function<void(const IndexProgress&)>& progress = {});

}  // namespace lode
