// stem_cache.h — bounded memo of folded word -> (index term, stopword?).
//
// Stemming dominates indexing time and natural text repeats a small
// vocabulary, so each Analyzer remembers its answers: up to `capacity`
// words, then the cache is simply cleared (cheaper than LRU bookkeeping on
// every hit; the frequent words come back within a few pages of text).
//
// An open-addressing table (linear probing, power-of-two size) whose slots
// hold the word and its stem inline, one 64-byte cache line each: a hit costs
// one hash, one cache line and one key compare. (Slots that pointed to
// separate entries cost two cache misses per word, a fifth of indexing time.)
// Pairs longer than a slot's 56 bytes go to a side list. Memory grows with
// use, so a query-time Analyzer that sees five words stays small.
//
// Thread safety: one thread at a time (owned by one Analyzer).
#pragma once

#include <cstddef>
#include <cstdint>
#include <cstring>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace lode::analysis {

class StemCache {
 public:
  // What make() computes for a word.
  struct Made {
    std::string term;  // the stem
    bool stopword;     // the folded word is on the stopword list
  };
  // A cached answer; `term` stays valid until the next get().
  struct Entry {
    std::string_view term;
    bool stopword;
  };

  // REQUIRES: capacity >= 1.
  explicit StemCache(std::size_t capacity) : capacity_(capacity) {}

  // The entry for `word`, computed by `make(word) -> Made` on a miss.
  template <typename Make>
  Entry get(std::string_view word, Make&& make) {
    return get(word, hash(word), make);
  }

  // The same with the word's hash(), after prefetch(hash) a few words
  // earlier: the slot's cache line is then (usually) already loaded.
  template <typename Make>
  Entry get(std::string_view word, std::uint64_t h, Make&& make) {
    const std::uint32_t tag = static_cast<std::uint32_t>(h >> 32) | 1u;  // 0 marks an empty slot
    if (!slots_.empty()) {
      for (std::size_t i = h & mask_;; i = (i + 1) & mask_) {
        const Slot& s = slots_[i];
        if (s.tag == 0) break;
        if (s.tag == tag && key(s) == word) return entry(s);
      }
    }
    Made made = make(word);
    return insert(h, tag, word, made);
  }

  std::size_t size() const { return size_; }

  // FNV-1a over the bytes, then a final mix so both halves are usable
  // (low bits pick the slot, high bits are the stored tag).
  static std::uint64_t hash(std::string_view s) {
    std::uint64_t h = 0xcbf29ce484222325ULL;
    for (const char c : s) h = (h ^ static_cast<unsigned char>(c)) * 0x100000001b3ULL;
    h ^= h >> 29;
    h *= 0xbf58476d1ce4e5b9ULL;
    return h ^ (h >> 32);
  }
  // Starts loading the slot where a word of hash `h` is looked up first.
  void prefetch(std::uint64_t h) const {
    if (!slots_.empty()) __builtin_prefetch(&slots_[h & mask_]);
  }

 private:
  static constexpr std::size_t kInline = 56;
  static constexpr std::uint8_t kLong = 0xFF;  // key_len: the pair is in long_[index]
  struct alignas(64) Slot {
    std::uint32_t tag = 0;
    std::uint8_t key_len = 0, term_len = 0;
    bool stopword = false;
    char bytes[kInline];  // key then term; or, when key_len == kLong, a long_ index
  };
  static_assert(sizeof(Slot) == 64);

  std::string_view key(const Slot& s) const {
    return s.key_len == kLong ? std::string_view(long_[index(s)].first) : std::string_view(s.bytes, s.key_len);
  }
  Entry entry(const Slot& s) const {
    if (s.key_len == kLong) return Entry{long_[index(s)].second, s.stopword};
    return Entry{std::string_view(s.bytes + s.key_len, s.term_len), s.stopword};
  }
  static std::size_t index(const Slot& s) {
    std::size_t i;
    std::memcpy(&i, s.bytes, sizeof i);
    return i;
  }

  Entry insert(std::uint64_t h, std::uint32_t tag, std::string_view word, const Made& made);
  Slot& free_slot(std::uint64_t h);
  void grow();

  std::size_t capacity_;
  std::size_t size_ = 0;
  std::vector<Slot> slots_;
  std::vector<std::pair<std::string, std::string>> long_;  // (word, stem) too long for a slot
  std::size_t mask_ = 0;
};

}  // namespace lode::analysis
