// The bounded stem cache against a plain std::map model.
#include <doctest/doctest.h>

#include <map>
#include <random>
#include <string>

#include "analysis/stem_cache.h"

using lode::analysis::StemCache;

TEST_CASE("stem cache: answers like the function it memoizes, computing only on misses") {
  for (const std::size_t capacity : {std::size_t{1}, std::size_t{7}, std::size_t{1000}, std::size_t{5000}}) {
    CAPTURE(capacity);
    StemCache cache(capacity);
    std::map<std::string, int> computed;  // how often make() ran per word
    auto make = [&](std::string_view w) {
      ++computed[std::string(w)];
      return StemCache::Made{"s:" + std::string(w), w.size() % 3 == 0};
    };
    std::mt19937 rng(static_cast<unsigned>(capacity));
    std::uniform_int_distribution<int> word(0, 3000);
    int wrong = 0;
    std::size_t max_size = 0;
    for (int i = 0; i < 60000; ++i) {
      const int n = word(rng) * word(rng) % 3001;  // skewed
      // One word in seven is too long to share a slot with its stem.
      const std::string w = "w" + std::to_string(n) + (n % 7 == 0 ? std::string(40, 'x') : "");
      const StemCache::Entry e = cache.get(w, make);
      wrong += e.term != "s:" + w || e.stopword != (w.size() % 3 == 0);
      max_size = std::max(max_size, cache.size());
    }
    CHECK(wrong == 0);
    CHECK(max_size <= capacity);
    std::size_t calls = 0;
    for (const auto& [w, n] : computed) calls += static_cast<std::size_t>(n);
    // With room for every distinct word, each is computed exactly once.
    if (capacity >= 5000) CHECK(calls == computed.size());
    if (capacity == 1) CHECK(calls > 50000);  // nearly every call misses
  }
}
