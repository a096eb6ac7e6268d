// The page a hit's snippet comes from, for paged documents (PDF).
#pragma once

#include <string_view>
#include <unordered_set>
#include <vector>

#include "lode/analysis.h"
#include "lode/index.h"

namespace lode::rank {

struct PageChoice {
  std::uint32_t page = 0;  // 1-based
  std::string_view text;   // that page's text within the body
};

// The page with the most occurrences of `terms` (analyzed forms); the first
// page on a tie or when none occurs. REQUIRES: !pages.empty(), offsets
// ascending and within `body` (a damaged map is clamped to the body).
PageChoice best_page(std::string_view body, const std::vector<PageStart>& pages, Analyzer& analyzer,
                     const std::unordered_set<std::string>& terms);

}  // namespace lode::rank
