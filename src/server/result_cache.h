// Search responses kept in memory, least recently used first out, bounded
// in bytes. The key holds the index name, its commit generation
// (CollectionStats::generation: equal generations hold equal contents) and
// every request parameter, so an entry answers exactly the request that
// made it, until the next commit moves the generation; entries of older
// generations are never asked for again and age out.
//
// Thread safety: every method may be called from any thread.
#pragma once

#include <atomic>
#include <cstddef>
#include <cstdint>
#include <list>
#include <map>
#include <memory>
#include <mutex>
#include <string>
#include <string_view>
#include <unordered_map>

namespace lode::server {

struct CacheCounters {
  std::uint64_t hits = 0, misses = 0;
  std::size_t entries = 0, bytes = 0, capacity_bytes = 0;
};

class ResultCache {
 public:
  // `capacity_bytes` 0 = nothing is kept (every lookup misses).
  explicit ResultCache(std::size_t capacity_bytes) : capacity_(capacity_bytes) {}

  // The key for a request: index name, generation and the parameters (a
  // sorted map, so their order in the URL does not matter; `skip` names a
  // parameter already folded into `index`).
  static std::string key(const std::string& index, std::uint64_t generation,
                         const std::map<std::string, std::string>& params, const std::string& skip);

  // The cached body, or null (counted as a hit or a miss).
  std::shared_ptr<const std::string> get(const std::string& key);
  // Keeps `body` under `key`, evicting the least recently used entries to
  // stay within capacity; a body larger than a quarter of it is not kept.
  void put(const std::string& key, std::string body);
  CacheCounters counters() const;

 private:
  struct Entry {
    std::string key;
    std::shared_ptr<const std::string> body;
  };
  static std::size_t cost(const Entry& e) { return e.key.size() * 2 + e.body->size() + 128; }

  const std::size_t capacity_;
  mutable std::mutex mu_;
  std::list<Entry> lru_;  // most recent first; guarded by mu_
  std::unordered_map<std::string_view, std::list<Entry>::iterator> index_;  // views into lru_ keys
  std::size_t bytes_ = 0;  // guarded by mu_
  std::atomic<std::uint64_t> hits_{0}, misses_{0};
};

}  // namespace lode::server
