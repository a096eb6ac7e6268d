// SlotTable: a key -> slot map over keys the caller keeps in its own vector
// (the slot is the key's index there). Used by the writer's batch dictionary
// ((field, term) -> term buffer) and by the JSON Lines repeated-id check.
// Open addressing over 64-bit cells (high half: hash tag, low half: slot + 1),
// so a lookup touches one cell array and compares a key only when the tags
// agree; std::unordered_map's node per entry cost a cache miss per token on
// large batches (bench/: the largest self time). `same(slot)` says whether a
// slot holds the key looked up.
#pragma once

#include <cstdint>
#include <functional>
#include <string_view>
#include <vector>

namespace lode {

class SlotTable {
 public:
  static constexpr std::uint32_t kNone = UINT32_MAX;

  static std::uint64_t hash(unsigned char field, std::string_view term) {
    return std::hash<std::string_view>{}(term) * 0x9E3779B97F4A7C15ULL + field;
  }

  // The slot for `h` whose key `same(slot)` accepts, or kNone.
  template <typename Same>
  std::uint32_t find(std::uint64_t h, Same&& same) const {
    if (cells_.empty()) return kNone;
    const std::uint64_t tag = h >> 32;
    for (std::size_t i = spot(tag) & mask_;; i = (i + 1) & mask_) {
      const std::uint64_t c = cells_[i];
      if (c == 0) return kNone;
      if ((c >> 32) == tag && same(static_cast<std::uint32_t>(c & 0xFFFFFFFFu) - 1))
        return static_cast<std::uint32_t>(c & 0xFFFFFFFFu) - 1;
    }
  }

  // Hints for a lookup of `h` a few tokens ahead (a batch's dictionary
  // outgrows the caches, so each lookup would otherwise wait on memory):
  // prefetch() asks for its first cell; guess() is the slot in the first
  // cell whose tag matches, or kNone, for prefetching the key.
  void prefetch(std::uint64_t h) const {
    if (!cells_.empty()) __builtin_prefetch(&cells_[spot(h >> 32) & mask_]);
  }
  std::uint32_t guess(std::uint64_t h) const {
    if (cells_.empty()) return kNone;
    const std::uint64_t tag = h >> 32;
    for (std::size_t i = spot(tag) & mask_;; i = (i + 1) & mask_) {
      const std::uint64_t c = cells_[i];
      if (c == 0) return kNone;
      if ((c >> 32) == tag) return static_cast<std::uint32_t>(c & 0xFFFFFFFFu) - 1;
    }
  }

  // REQUIRES: no entry for this key yet; slot < UINT32_MAX - 1.
  void insert(std::uint64_t h, std::uint32_t slot) {
    if (2 * (size_ + 1) > cells_.size()) grow();
    place(h >> 32, slot + 1);
    ++size_;
  }

  // Memory held by the cells, by allocation.
  std::size_t bytes() const { return cells_.capacity() * sizeof(std::uint64_t); }

  // Frees the cells.
  void clear() {
    decltype(cells_)().swap(cells_);
    size_ = 0;
    mask_ = 0;
  }

 private:
  // Cells keep only the tag, so positions come from the tag alone (re-mixed):
  // growing can then re-place every cell without the keys.
  static std::size_t spot(std::uint64_t tag) { return static_cast<std::size_t>(tag * 0xC2B2AE3D27D4EB4FULL >> 7); }

  void place(std::uint64_t tag, std::uint64_t slot1) {
    for (std::size_t i = spot(tag) & mask_;; i = (i + 1) & mask_)
      if (cells_[i] == 0) {
        cells_[i] = tag << 32 | slot1;
        return;
      }
  }

  void grow() {
    std::vector<std::uint64_t> old = std::move(cells_);
    cells_.assign(old.empty() ? 1024 : old.size() * 2, 0);
    mask_ = cells_.size() - 1;
    for (std::uint64_t c : old)
      if (c != 0) place(c >> 32, c & 0xFFFFFFFFu);
  }

  std::vector<std::uint64_t> cells_;
  std::size_t size_ = 0, mask_ = 0;
};

}  // namespace lode
