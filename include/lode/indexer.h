// lode/indexer.h — bringing an index up to date with folders on disk.
//
// index_paths() crawls the roots, compares each file with what the index
// recorded (size and mtime first; the content hash when those differ), reads
// only new or changed files, removes files that disappeared from under a
// root, and commits. A new file with the content of a file that disappeared
// in the same run is a rename: the index moves the old documents to the new
// path without extracting again. One unreadable file never stops the run: it
// is reported in IndexReport::problems, recorded in the index (see
// IndexWriter::record_problems), and the file's previous version stays indexed.
//
// Document ids: a file's documents are named by its path relative to the root
// it was found under (a JSON Lines record by its id field). Two files with the
// same relative path under two roots therefore give the same id: both are
// indexed, and each such file of a run gets a warning naming the other; a
// lookup by that id finds only one of them.
//
// Extraction runs on `jobs` worker threads (std::jthread); the calling thread
// alone talks to the IndexWriter and applies the results in crawl order, so a
// run gives the same document ids whatever the thread count.
//
// watch_paths() indexes once, then keeps the index current from inotify
// events until cancelled.
//
// Thread safety: uses the given IndexWriter; one call at a time per writer.
// The callbacks are called on the calling thread.
#pragma once

#include <functional>
#include <map>
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
  // Polled between files, and between the parts of a JSON Lines file read
  // in parts; returning true commits what is done and stops (a file stopped
  // in parts is read again by the next run).
  std::function<bool()> cancelled;
  // Extraction threads; 0 = one per core (std::thread::hardware_concurrency).
  unsigned jobs = 0;
  // Files read ahead of the writer at most, and the extracted text they may
  // hold together: a worker starts no new file while finished results
  // waiting for the writer hold more (one file always proceeds). Both bound
  // the memory beside the writer's batch: 64 small files cost nothing, while
  // 64 record dumps of 20 MB each would hold 1.3 GB. 16 MiB keeps the
  // writer fed (it, not extraction, is the bottleneck; bench/README.md).
  std::size_t read_ahead = 64;
  std::size_t read_ahead_bytes = std::size_t{16} << 20;
  // Bytes of a large JSON Lines file read per part (ReadOptions::
  // stream_jsonl_bytes says which files): thousands of records a part, small
  // beside the writer's batch.
  std::size_t stream_part_bytes = std::size_t{8} << 20;
};

struct IndexProgress {
  std::size_t files_done = 0, files_total = 0;
  std::uint64_t bytes_done = 0, bytes_total = 0;
  std::string_view current;  // path whose result is applied next (workers read ahead of it);
                             // a file deleted by then is treated as vanished
};

// Files and documents of one kind ("pdf", "html", ...; "?" for failures
// whose kind is unknown) in a run.
struct KindCount {
  std::size_t files = 0;      // files read (added or updated)
  std::size_t documents = 0;
  std::size_t failed = 0;
  std::uint64_t bytes = 0;
};

struct FileProblem {
  std::string path;
  std::string message;  // the error, naming the reason
};

// The kind recorded for a skipped binary or media file (it has no documents).
inline constexpr const char* kSkippedKind = "binary";

struct IndexReport {
  std::size_t added = 0;      // files new to the index
  std::size_t updated = 0;    // files whose content changed
  std::size_t unchanged = 0;  // files skipped (same size+mtime, or same hash)
  std::size_t removed = 0;    // files gone from disk, removed from the index
  std::size_t renamed = 0;    // files moved without a content change (not re-read)
  std::size_t failed = 0;     // files that could not be read (see problems)
  std::size_t skipped = 0;    // binary and media files recognised and not indexed
                              // (ReadResult::skipped): not failures; recorded with
                              // kind kSkippedKind so they are not read again while
                              // their size and mtime stay the same
  std::size_t documents = 0;  // documents added or replaced
  std::uint64_t bytes_read = 0;
  bool cancelled = false;
  std::vector<FileProblem> problems;  // failed files and crawl problems
  std::vector<FileProblem> warnings;  // files indexed with a warning (bad UTF-8, bad JSONL lines,
                                      // a document id another root's file already gives)
  std::map<std::string, KindCount> by_kind;  // read and failed files by kind (extension for failures)
};

// Errors returned (as opposed to reported per file): a root that does not
// exist, and index write failures (after which nothing uncommitted is kept).
Result<IndexReport> index_paths(IndexWriter& writer, const std::vector<std::string>& roots,
                                const IndexRunOptions& options,
                                const std::function<void(const IndexProgress&)>& progress = {});

struct WatchOptions {
  // Events are gathered until this long passes without a new one, then the
  // roots are brought up to date in one run (a burst = one run).
  int quiet_ms = 500;
  // While a root is missing (moved away or unmounted), how often to look for it.
  int recheck_ms = 2000;
};

// What watch_paths() reports between runs.
struct WatchEvent {
  enum class Type {
    kIndexed,        // a run finished; `report` is set
    kRootGone,       // a root was moved, deleted or unmounted; `message` says which
    kRootBack,       // a missing root is back; a run follows
    kWatchProblem,   // a folder could not be watched (e.g. the inotify watch limit)
  } type;
  std::string message;
  const IndexReport* report = nullptr;  // kIndexed only; valid during the callback
};

// Runs index_paths() once, then watches every folder under the roots with
// inotify and runs it again after each burst of changes, until
// options.cancelled returns true (polled at least every 200 ms). A root that
// goes away is reported once (kRootGone) and its files stay indexed until it
// comes back; nothing is removed while a root is missing. Errors: those of
// index_paths(), IOError when inotify is not available.
Status watch_paths(IndexWriter& writer, const std::vector<std::string>& roots, const IndexRunOptions& options,
                   const WatchOptions& watch, const std::function<void(const WatchEvent&)>& on_event);

}  // namespace lode
