// The stem cache's slow paths (see stem_cache.h).
#include "analysis/stem_cache.h"

#include <algorithm>

namespace lode::analysis {

StemCache::Entry StemCache::insert(std::uint64_t h, std::uint32_t tag, std::string_view word, const Made& made) {
  if (size_ >= capacity_) {
    std::fill(slots_.begin(), slots_.end(), Slot{});
    long_.clear();
    size_ = 0;
  }
  // At most three quarters full: linear probes stay short, and the next
  // slot is the next cache line, which the hardware fetches ahead.
  if ((size_ + 1) * 4 > slots_.size() * 3) grow();
  Slot& s = free_slot(h);
  s.tag = tag;
  s.stopword = made.stopword;
  if (word.size() + made.term.size() <= kInline && word.size() < kLong) {
    s.key_len = static_cast<std::uint8_t>(word.size());
    s.term_len = static_cast<std::uint8_t>(made.term.size());
    std::memcpy(s.bytes, word.data(), word.size());
    std::memcpy(s.bytes + word.size(), made.term.data(), made.term.size());
  } else {
    s.key_len = kLong;
    const std::size_t i = long_.size();
    long_.emplace_back(std::string(word), made.term);
    std::memcpy(s.bytes, &i, sizeof i);
  }
  ++size_;
  return entry(s);
}

StemCache::Slot& StemCache::free_slot(std::uint64_t h) {
  std::size_t i = h & mask_;
  while (slots_[i].tag != 0) i = (i + 1) & mask_;
  return slots_[i];
}

void StemCache::grow() {
  std::vector<Slot> old = std::move(slots_);
  const std::size_t size = std::max<std::size_t>(1024, old.size() * 2);
  slots_.assign(size, Slot{});
  mask_ = size - 1;
  for (const Slot& s : old)
    if (s.tag != 0) free_slot(hash(key(s))) = s;
}

}  // namespace lode::analysis
