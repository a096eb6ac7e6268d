#include "server/reader_pool.h"

namespace lode::server {

Lease::~Lease() {
  if (pool_ && set_) pool_->release(std::move(set_));
}

const std::string& Lease::index_name() const { return pool_->name(); }

Result<std::unique_ptr<ReaderSet>> ReaderPool::open_set() const {
  auto set = std::make_unique<ReaderSet>();
  auto reader = IndexReader::open(path_, ReaderOptions{cache_});
  if (!reader) return reader.status();
  set->reader = std::move(reader.value());
  auto searcher = Searcher::create(*set->reader);
  if (!searcher) return searcher.status();
  set->searcher = std::move(searcher.value());
  auto analyzer = Analyzer::create(set->reader->settings().analyzer);
  if (!analyzer) return analyzer.status();
  set->analyzer = std::move(analyzer.value());
  return set;
}

Result<Lease> ReaderPool::acquire(std::chrono::milliseconds wait) {
  std::unique_lock lock(mu_);
  if (!freed_.wait_for(lock, wait, [&] { return !idle_.empty() || opened_ < capacity_; }))
    return Status::Busy("every reader of index '" + name_ + "' stayed in use for " + std::to_string(wait.count()) +
                        " ms; try again");
  if (!idle_.empty()) {
    auto set = std::move(idle_.back());
    idle_.pop_back();
    return Lease(this, std::move(set));
  }
  ++opened_;
  lock.unlock();  // opening reads the file: do it outside the lock
  auto set = open_set();
  if (!set) {
    std::lock_guard relock(mu_);
    --opened_;
    freed_.notify_one();
    return set.status();
  }
  return Lease(this, std::move(set.value()));
}

void ReaderPool::release(std::unique_ptr<ReaderSet> set) {
  std::lock_guard lock(mu_);
  idle_.push_back(std::move(set));
  freed_.notify_one();
}

}  // namespace lode::server
