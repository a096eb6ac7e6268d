#include "explore/terms.h"

#include <algorithm>
#include <map>

#include "explore/top_n.h"

namespace lode::explore {

Result<std::vector<NamedWeight>> merge_fields(VectorSource& src, const std::vector<TermWeight>& weights,
                                              std::size_t n) {
  std::map<std::string, NamedWeight> merged;
  for (auto& e : weights) {
    if (e.weight == 0) continue;
    auto info = src.term(e.term);
    if (!info) return info.status();
    NamedWeight& w = merged[(*info)->term];
    w.term = (*info)->term;
    w.weight += e.weight;
    w.df = std::max(w.df, (*info)->df);
  }
  std::vector<NamedWeight> out;
  for (auto& [term, w] : merged) out.push_back(std::move(w));
  auto heavier = [](const NamedWeight& a, const NamedWeight& b) {
    return a.weight != b.weight ? a.weight > b.weight : a.term < b.term;
  };
  keep_top(out, n, heavier);
  return out;
}

}  // namespace lode::explore
