// Turning weighted term ids into weighted words (private to src/explore).
#pragma once

#include <string>
#include <vector>

#include "lode/vectors.h"

namespace lode::explore {

struct NamedWeight {
  std::string term;       // the index term (stem)
  double weight = 0;      // summed over the word's title and body dimensions
  std::uint64_t df = 0;   // largest df over those dimensions
};

// Adds up each word's dimensions; returns the `n` heaviest words, heaviest
// first (ties: alphabetical). REQUIRES: an active read scope.
Result<std::vector<NamedWeight>> merge_fields(VectorSource& src, const std::vector<TermWeight>& weights,
                                              std::size_t n);

}  // namespace lode::explore
