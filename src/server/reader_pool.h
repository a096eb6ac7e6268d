// Readers checked out per request: IndexReader, Searcher and Analyzer are
// single-threaded objects, so each request borrows one set and returns it.
// At most `capacity` sets exist per index (one per worker thread), opened on
// first need and kept: opening costs a file open and a few prepared statements.
#pragma once

#include <chrono>
#include <condition_variable>
#include <memory>
#include <mutex>
#include <string>
#include <vector>

#include "lode/analysis.h"
#include "lode/index.h"
#include "lode/ranking.h"

namespace lode::server {

struct ReaderSet {
  std::unique_ptr<IndexReader> reader;      // declared first: the others refer to it
  std::unique_ptr<Searcher> searcher;
  std::unique_ptr<Analyzer> analyzer;       // for marking words in stored text
};

class ReaderPool;

// A borrowed ReaderSet, returned to its pool on destruction.
class Lease {
 public:
  Lease(ReaderPool* pool, std::unique_ptr<ReaderSet> set) : pool_(pool), set_(std::move(set)) {}
  Lease(Lease&&) = default;
  ~Lease();
  ReaderSet* operator->() { return set_.get(); }
  ReaderSet& operator*() { return *set_; }
  const std::string& index_name() const;

 private:
  ReaderPool* pool_;
  std::unique_ptr<ReaderSet> set_;
};

class ReaderPool {
 public:
  ReaderPool(std::string name, std::string path, std::size_t capacity)
      : name_(std::move(name)), path_(std::move(path)), capacity_(capacity) {}
  const std::string& name() const { return name_; }
  const std::string& path() const { return path_; }

  // A set within `wait`, or Busy when every set stays in use that long;
  // errors of opening the index otherwise.
  Result<Lease> acquire(std::chrono::milliseconds wait);

 private:
  friend class Lease;
  void release(std::unique_ptr<ReaderSet> set);
  Result<std::unique_ptr<ReaderSet>> open_set() const;

  std::string name_, path_;
  std::size_t capacity_;
  // One copy of the norms and decoded postings for all of this index's sets
  // (lode/index.h): memory per index, not per worker thread.
  std::shared_ptr<ReaderCache> cache_ = std::make_shared<ReaderCache>();
  std::mutex mu_;
  std::condition_variable freed_;
  std::vector<std::unique_ptr<ReaderSet>> idle_;  // guarded by mu_
  std::size_t opened_ = 0;                        // guarded by mu_
};

}  // namespace lode::server
