// Parallel extraction for index_paths() (private to src/indexer/): worker
// threads read files ahead of the single writer thread, which takes the
// results back in job order.
#pragma once

#include <condition_variable>
#include <cstddef>
#include <map>
#include <mutex>
#include <optional>
#include <string>
#include <thread>
#include <vector>

#include "lode/ingest.h"

namespace lode::indexer {

struct ReadJob {
  // The crawl's copy, which must outlive the pool (a million files would
  // otherwise hold their paths twice).
  const std::string* path = nullptr;
  // Content hashes of files that vanished with this file's size: when the
  // file's hash is one of these it is a rename and is not extracted.
  std::vector<std::string> rename_hashes;
  // A large JSON Lines file the writer thread reads itself with JsonlStream:
  // the worker only hashes it.
  bool stream = false;
};

struct ReadOutcome {
  std::string renamed_hash;            // set when the file is a rename (read is then empty)
  // Unless renamed: for a stream job, the content hash (ok) or why the file
  // could not be hashed; otherwise the extracted file or why it failed.
  std::optional<Result<ReadResult>> read;
};

class ExtractPool {
 public:
  // Starts `threads` workers (at least 1) over `jobs`. A worker starts the
  // next job only while fewer than `ahead` results wait unclaimed and their
  // documents hold at most `ahead_bytes` of text (or none waits at all).
  ExtractPool(std::vector<ReadJob> jobs, ReadOptions options, unsigned threads, std::size_t ahead,
              std::size_t ahead_bytes);
  ~ExtractPool();  // stops and joins the workers
  ExtractPool(const ExtractPool&) = delete;
  ExtractPool& operator=(const ExtractPool&) = delete;

  // The outcome of job `i`, waiting for it if needed. REQUIRES: i ascending
  // across calls, i < number of jobs.
  ReadOutcome take(std::size_t i);

 private:
  void work(std::stop_token stop);

  std::vector<ReadJob> jobs_;
  ReadOptions options_;
  std::size_t ahead_;
  std::size_t ahead_bytes_;
  std::size_t waiting_bytes_ = 0;  // text held by finished, unclaimed results
  std::mutex mu_;
  // Held while a file that unpacks (gzip, a zip container) is read: one
  // unpacks at a time, so its bytes, up to ReadOptions::max_unpacked_bytes,
  // are held once and not once per worker, whatever `threads` is.
  std::mutex unpack_mu_;
  std::condition_variable_any cv_;
  // Finished, unclaimed outcomes by job (at most `ahead` of them: a vector
  // with a slot per job cost 150 bytes a file on a million-file crawl).
  std::map<std::size_t, ReadOutcome> done_;
  std::size_t next_ = 0;   // next job to hand to a worker
  std::size_t taken_ = 0;  // jobs the consumer has taken
  static constexpr std::size_t kNone = static_cast<std::size_t>(-1);
  std::size_t awaited_ = kNone;  // the job the consumer is waiting for
  std::vector<std::jthread> workers_;
};

}  // namespace lode::indexer
