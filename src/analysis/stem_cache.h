// stem_cache.h — bounded memo of folded word -> (index term, stopword?).
//
// Stemming dominates indexing time and natural text repeats a small
// vocabulary, so each Analyzer remembers its answers: up to `capacity`
// words, then the cache is simply cleared (cheaper than LRU bookkeeping on
// every hit; the frequent words come back within a few pages of text).
//
// An open-addressing table with power-of-two size and the hash kept beside
// each slot: a hit costs one hash, one probe and one key compare, with no
// division and no pointer chasing (std::unordered_map spent most of
// analyze()'s time in both). Memory grows with use, so a query-time Analyzer
// that sees five words stays small.
//
// Thread safety: one thread at a time (owned by one Analyzer).
#pragma once

#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace lode::analysis {

class StemCache {
 public:
  struct Entry {
    std::string term;  // the stem
    bool stopword;     // the folded word is on the stopword list
  };

  // REQUIRES: capacity >= 1.
  explicit StemCache(std::size_t capacity) : capacity_(capacity) {}

  // The entry for `word`, computed by `make(word) -> Entry` on a miss. The
  // reference stays valid until the next call.
  template <typename Make>
  const Entry& get(std::string_view word, Make&& make) {
    const std::uint64_t h = hash(word);
    if (!slots_.empty()) {
      for (std::size_t i = h & mask_;; i = (i + 1) & mask_) {
        const std::uint64_t s = slots_[i];
        if (s == 0) break;
        if ((s >> 32) == (h >> 32)) {
          Item& item = items_[(s & 0xFFFFFFFFu) - 1];
          if (item.key == word) return item.entry;
        }
      }
    }
    return insert(h, word, make(word));
  }

  std::size_t size() const { return items_.size(); }

 private:
  struct Item {
    std::string key;
    Entry entry;
  };

  // FNV-1a over the bytes, then a final mix so both halves are usable
  // (low bits pick the slot, high bits are the stored tag).
  static std::uint64_t hash(std::string_view s) {
    std::uint64_t h = 0xcbf29ce484222325ULL;
    for (const char c : s) h = (h ^ static_cast<unsigned char>(c)) * 0x100000001b3ULL;
    h ^= h >> 29;
    h *= 0xbf58476d1ce4e5b9ULL;
    return h ^ (h >> 32);
  }

  const Entry& insert(std::uint64_t h, std::string_view word, Entry entry);
  void place(std::uint64_t h, std::size_t item_index);
  void grow();

  std::size_t capacity_;
  std::vector<Item> items_;
  std::vector<std::uint64_t> slots_;  // (hash tag << 32) | (item index + 1); 0 = empty
  std::size_t mask_ = 0;
};

}  // namespace lode::analysis
