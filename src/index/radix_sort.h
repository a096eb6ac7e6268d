// radix_sort_by_bits(): sorts 64-bit words by a range of their bits, for the
// writer's forward lists (term id << 32 | tf, a few hundred words a document
// and millions a flush). Least significant digit first, 8 bits a pass, so
// ids below 2^24 take 3 passes of linear work where std::sort's comparisons
// cost about three times as much (bench/: the sort was 5% of indexing time).
#pragma once

#include <algorithm>
#include <array>
#include <cstdint>
#include <vector>

namespace lode {

// Sorts `words` ascending by bits [low_bit, high_bit) (high_bit <= 64),
// keeping the order of words whose bits there are equal (stable). `scratch`
// is reused between calls to save allocations.
inline void radix_sort_by_bits(std::vector<std::uint64_t>& words, std::vector<std::uint64_t>& scratch,
                               unsigned low_bit, unsigned high_bit) {
  if (words.size() < 2 || high_bit <= low_bit) return;
  const unsigned bits = high_bit - low_bit;
  const std::uint64_t key_mask = bits >= 64 ? ~std::uint64_t{0} : (std::uint64_t{1} << bits) - 1;
  const auto key = [&](std::uint64_t w) { return (w >> low_bit) & key_mask; };
  if (words.size() <= 32) {  // insertion sort: passes over 256 buckets would cost more
    for (std::size_t i = 1; i < words.size(); ++i) {
      const std::uint64_t w = words[i];
      std::size_t j = i;
      for (; j > 0 && key(words[j - 1]) > key(w); --j) words[j] = words[j - 1];
      words[j] = w;
    }
    return;
  }
  scratch.resize(words.size());
  for (unsigned shift = low_bit; shift < high_bit; shift += 8) {
    const std::uint64_t mask = (std::uint64_t{1} << std::min(8u, high_bit - shift)) - 1;
    std::array<std::size_t, 257> start{};
    for (const std::uint64_t w : words) ++start[((w >> shift) & mask) + 1];
    if (start[((words[0] >> shift) & mask) + 1] == words.size()) continue;  // one digit value: nothing moves
    for (std::size_t b = 1; b < start.size(); ++b) start[b] += start[b - 1];
    for (const std::uint64_t w : words) scratch[start[(w >> shift) & mask]++] = w;
    words.swap(scratch);
  }
}

}  // namespace lode
