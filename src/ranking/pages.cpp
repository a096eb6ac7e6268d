#include "ranking/pages.h"

#include <algorithm>

namespace lode::rank {

PageChoice best_page(std::string_view body, const std::vector<PageStart>& pages, Analyzer& analyzer,
                     const std::unordered_set<std::string>& terms) {
  auto page_text = [&](std::size_t i) {
    const std::size_t b = std::min<std::size_t>(pages[i].offset, body.size());
    const std::size_t e = i + 1 < pages.size() ? std::min<std::size_t>(pages[i + 1].offset, body.size()) : body.size();
    return body.substr(b, e > b ? e - b : 0);
  };
  std::size_t best = 0, best_count = 0;
  for (std::size_t i = 0; i < pages.size(); ++i) {
    std::size_t count = 0;
    for (auto& t : analyzer.analyze(page_text(i)).tokens) count += terms.count(t.term);
    if (count > best_count) {
      best = i;
      best_count = count;
    }
  }
  return PageChoice{static_cast<std::uint32_t>(best + 1), page_text(best)};
}

}  // namespace lode::rank
