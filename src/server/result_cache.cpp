#include "server/result_cache.h"

namespace lode::server {

std::string ResultCache::key(const std::string& index, std::uint64_t generation,
                             const std::map<std::string, std::string>& params, const std::string& skip) {
  // Length-prefixed fields: no parameter value can forge another's boundary.
  std::string k = std::to_string(index.size()) + ":" + index + "@" + std::to_string(generation);
  for (const auto& [name, value] : params) {
    if (name == skip) continue;
    k += ";" + std::to_string(name.size()) + ":" + name + "=" + std::to_string(value.size()) + ":" + value;
  }
  return k;
}

std::shared_ptr<const std::string> ResultCache::get(const std::string& key) {
  std::lock_guard lock(mu_);
  auto it = index_.find(key);
  if (it == index_.end()) {
    ++misses_;
    return nullptr;
  }
  lru_.splice(lru_.begin(), lru_, it->second);
  ++hits_;
  return it->second->body;
}

void ResultCache::put(const std::string& key, std::string body) {
  Entry e{key, std::make_shared<const std::string>(std::move(body))};
  const std::size_t c = cost(e);
  if (c > capacity_ / 4) return;
  std::lock_guard lock(mu_);
  if (index_.count(key)) return;  // another worker answered the same request first
  lru_.push_front(std::move(e));
  index_.emplace(lru_.front().key, lru_.begin());
  bytes_ += c;
  while (bytes_ > capacity_ && !lru_.empty()) {
    bytes_ -= cost(lru_.back());
    index_.erase(lru_.back().key);
    lru_.pop_back();
  }
}

CacheCounters ResultCache::counters() const {
  std::lock_guard lock(mu_);
  return {hits_.load(), misses_.load(), lru_.size(), bytes_, capacity_};
}

}  // namespace lode::server
