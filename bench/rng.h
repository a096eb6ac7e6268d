// bench/rng.h — a small seeded random generator whose output is the same on
// every platform and standard library.
//
// std::mt19937_64 is portable but the std:: distributions are not (their
// algorithms are implementation-defined), so the generated corpus and query
// set would differ between toolchains. xoshiro256** (Blackman & Vigna 2018)
// seeded through splitmix64, with our own uniform mappings, fixes the output
// for a given seed everywhere.
//
// Thread safety: a value type; one thread per instance.
#pragma once

#include <cstddef>
#include <cstdint>

namespace lode::bench {

class Rng {
 public:
  explicit Rng(std::uint64_t seed) {
    for (auto& s : s_) s = splitmix64(seed);
  }

  std::uint64_t next() {
    const std::uint64_t result = rotl(s_[1] * 5, 7) * 9;
    const std::uint64_t t = s_[1] << 17;
    s_[2] ^= s_[0];
    s_[3] ^= s_[1];
    s_[1] ^= s_[2];
    s_[0] ^= s_[3];
    s_[2] ^= t;
    s_[3] = rotl(s_[3], 45);
    return result;
  }

  // Uniform in [0, 1) with 53 random bits.
  double uniform() { return static_cast<double>(next() >> 11) * 0x1.0p-53; }

  // Uniform integer in [0, n). REQUIRES: n > 0. Lemire's multiply-shift; the
  // bias (< n / 2^64) is far below anything a benchmark could notice.
  std::size_t below(std::size_t n) {
    return static_cast<std::size_t>((static_cast<unsigned __int128>(next()) * n) >> 64);
  }

  // Uniform integer in [lo, hi]. REQUIRES: lo <= hi.
  std::size_t between(std::size_t lo, std::size_t hi) { return lo + below(hi - lo + 1); }

  bool chance(double p) { return uniform() < p; }

 private:
  static std::uint64_t rotl(std::uint64_t x, int k) { return (x << k) | (x >> (64 - k)); }
  static std::uint64_t splitmix64(std::uint64_t& x) {
    std::uint64_t z = (x += 0x9E3779B97F4A7C15ULL);
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
    return z ^ (z >> 31);
  }
  std::uint64_t s_[4];
};

}  // namespace lode::bench
