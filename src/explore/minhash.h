// MinHash signatures and LSH band keys (private to src/explore; method and
// references in lode/twins.h).
#pragma once

#include <cstdint>
#include <string>
#include <vector>

namespace lode::explore {

// A stable 64-bit mixer (splitmix64's finaliser): equal input, equal output on
// every platform, so signatures are reproducible for a seed.
std::uint64_t mix64(std::uint64_t x);
// FNV-1a 64 of a string, then mixed: a stable hash of a term.
std::uint64_t hash_text(const std::string& s);

// Hashes of the runs of `k` consecutive items of `items` (k >= 1), sorted and
// without repeats. Fewer than k items give one shingle of all of them.
std::vector<std::uint64_t> shingles(const std::vector<std::uint64_t>& items, std::size_t k);

class MinHasher {
 public:
  MinHasher(std::size_t hashes, std::uint64_t seed);
  // One minimum per hash function. REQUIRES: !shingles.empty().
  std::vector<std::uint64_t> signature(const std::vector<std::uint64_t>& shingles) const;

 private:
  std::vector<std::uint64_t> seeds_;
};

// The key of band `band` (rows values starting at band * rows) of a signature.
std::uint64_t band_key(const std::vector<std::uint64_t>& signature, std::size_t band, std::size_t rows);

}  // namespace lode::explore
