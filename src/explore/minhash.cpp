// MinHash signatures, shingles and band keys (see minhash.h).
#include "explore/minhash.h"

#include <algorithm>
#include <limits>

namespace lode::explore {

std::uint64_t mix64(std::uint64_t x) {
  x += 0x9e3779b97f4a7c15ULL;
  x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9ULL;
  x = (x ^ (x >> 27)) * 0x94d049bb133111ebULL;
  return x ^ (x >> 31);
}

std::uint64_t hash_text(const std::string& s) {
  std::uint64_t h = 0xcbf29ce484222325ULL;
  for (unsigned char c : s) h = (h ^ c) * 0x100000001b3ULL;
  return mix64(h);
}

std::vector<std::uint64_t> shingles(const std::vector<std::uint64_t>& items, std::size_t k) {
  std::vector<std::uint64_t> out;
  if (items.empty()) return out;
  std::size_t width = std::min(k, items.size());
  for (std::size_t i = 0; i + width <= items.size(); ++i) {
    std::uint64_t h = 0;
    for (std::size_t j = 0; j < width; ++j) h = mix64(h ^ items[i + j]);
    out.push_back(h);
  }
  std::sort(out.begin(), out.end());
  out.erase(std::unique(out.begin(), out.end()), out.end());
  return out;
}

MinHasher::MinHasher(std::size_t hashes, std::uint64_t seed) {
  for (std::size_t i = 0; i < hashes; ++i) seeds_.push_back(mix64(seed * 0x632be59bd9b4e019ULL + i));
}

std::vector<std::uint64_t> MinHasher::signature(const std::vector<std::uint64_t>& sh) const {
  std::vector<std::uint64_t> sig(seeds_.size(), std::numeric_limits<std::uint64_t>::max());
  for (std::size_t i = 0; i < seeds_.size(); ++i) {
    std::uint64_t m = sig[i], s = seeds_[i];
    for (std::uint64_t x : sh) m = std::min(m, mix64(x ^ s));
    sig[i] = m;
  }
  return sig;
}

std::uint64_t band_key(const std::vector<std::uint64_t>& signature, std::size_t band, std::size_t rows) {
  std::uint64_t h = mix64(band + 1);
  for (std::size_t r = 0; r < rows; ++r) h = mix64(h ^ signature[band * rows + r]);
  return h;
}

}  // namespace lode::explore
