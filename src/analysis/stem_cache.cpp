// The stem cache's slow paths (see stem_cache.h).
#include "analysis/stem_cache.h"

#include <algorithm>
#include <utility>

namespace lode::analysis {

const StemCache::Entry& StemCache::insert(std::uint64_t h, std::string_view word, Entry entry) {
  if (items_.size() >= capacity_) {
    items_.clear();
    std::fill(slots_.begin(), slots_.end(), 0);
  }
  // Keep the table at most half full so probes stay short.
  if ((items_.size() + 1) * 2 > slots_.size()) grow();
  items_.push_back(Item{std::string(word), std::move(entry)});
  place(h, items_.size() - 1);
  return items_.back().entry;
}

void StemCache::place(std::uint64_t h, std::size_t item_index) {
  std::size_t i = h & mask_;
  while (slots_[i] != 0) i = (i + 1) & mask_;
  slots_[i] = ((h >> 32) << 32) | (item_index + 1);
}

void StemCache::grow() {
  const std::size_t size = std::max<std::size_t>(1024, slots_.size() * 2);
  slots_.assign(size, 0);
  mask_ = size - 1;
  for (std::size_t k = 0; k < items_.size(); ++k) place(hash(items_[k].key), k);
}

}  // namespace lode::analysis
