// ChunkedVector: an append-only array kept in fixed-size chunks. Growing it
// never moves what it holds, so a batch of hundreds of MiB never exists
// twice (a std::vector's reallocation briefly needs old + new, 3x its size)
// and indexing stays two loads. The writer's batch keeps its term table,
// posting log and positions bytes in these.
//
// Thread safety: none (one writer owns it).
#pragma once

#include <algorithm>
#include <cstddef>
#include <cstring>
#include <memory>
#include <type_traits>
#include <utility>
#include <vector>

#include "index/big_array.h"

namespace lode {

// `kBits`: log2 of the elements per chunk.
template <typename T, unsigned kBits>
class ChunkedVector {
 public:
  static constexpr std::size_t kChunk = std::size_t{1} << kBits;

  T& operator[](std::size_t i) { return chunks_[i >> kBits][i & (kChunk - 1)]; }
  const T& operator[](std::size_t i) const { return chunks_[i >> kBits][i & (kChunk - 1)]; }
  std::size_t size() const { return size_; }

  T& push_back(T v) {
    if (size_ == chunks_.size() * kChunk) add_chunk();
    T& slot = (*this)[size_++];
    slot = std::move(v);
    return slot;
  }

  // Appends n trivially copyable elements.
  void append(const T* p, std::size_t n) {
    static_assert(std::is_trivially_copyable_v<T>);
    while (n > 0) {
      if (size_ == chunks_.size() * kChunk) add_chunk();
      const std::size_t at = size_ & (kChunk - 1);
      const std::size_t k = std::min(n, kChunk - at);
      std::memcpy(&chunks_[size_ >> kBits][at], p, k * sizeof(T));
      size_ += k;
      p += k;
      n -= k;
    }
  }

  // Appends elements [begin, end) to `out` (anything with append(const T*, n)).
  template <typename Out>
  void copy_to(Out& out, std::size_t begin, std::size_t end) const {
    while (begin < end) {
      const std::size_t at = begin & (kChunk - 1);
      const std::size_t k = std::min(end - begin, kChunk - at);
      out.append(&chunks_[begin >> kBits][at], k);
      begin += k;
    }
  }

  // Memory held, counted by allocation (whole chunks and the chunk index).
  std::size_t bytes() const { return chunks_.size() * kChunk * sizeof(T) + chunks_.capacity() * sizeof(void*); }

  // Frees every chunk.
  void clear() {
    decltype(chunks_)().swap(chunks_);
    size_ = 0;
  }

 private:
  // Default-initialised: plain values are not zeroed (pages are touched on
  // use). Chunks of plain values after the first may use huge pages.
  using Chunk = std::conditional_t<std::is_trivially_copyable_v<T>, BigArray<T>, std::unique_ptr<T[]>>;
  void add_chunk() {
    if constexpr (std::is_trivially_copyable_v<T>)
      chunks_.push_back(big_array<T>(kChunk, !chunks_.empty()));
    else
      chunks_.push_back(std::make_unique_for_overwrite<T[]>(kChunk));
  }

  std::vector<Chunk> chunks_;
  std::size_t size_ = 0;
};

}  // namespace lode
