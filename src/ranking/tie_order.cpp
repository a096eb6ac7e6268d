#include "ranking/tie_order.h"

#include <algorithm>
#include <numeric>
#include <string>

namespace lode::rank {

Status order_by_visible_id(IndexReader& reader, std::vector<ScoredDoc>& ranked, std::size_t keep) {
  // Runs of equal scores are contiguous: reorder each run that starts before
  // the cut (one starting after it is cut whole).
  for (std::size_t begin = 0; begin < ranked.size() && begin < keep;) {
    std::size_t end = begin + 1;
    while (end < ranked.size() && ranked[end].score == ranked[begin].score) ++end;
    if (end - begin > 1) {
      std::vector<std::string> ids(end - begin);
      for (std::size_t i = begin; i < end; ++i) {
        auto info = reader.document(ranked[i].doc);
        if (!info) return info.status();
        ids[i - begin] = std::move(info->external_id);
      }
      std::vector<std::size_t> order(end - begin);
      std::iota(order.begin(), order.end(), std::size_t{0});
      std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
        return ids[a] != ids[b] ? ids[a] < ids[b] : ranked[begin + a].doc < ranked[begin + b].doc;
      });
      std::vector<ScoredDoc> run;
      run.reserve(order.size());
      for (std::size_t i : order) run.push_back(std::move(ranked[begin + i]));
      std::move(run.begin(), run.end(), ranked.begin() + static_cast<std::ptrdiff_t>(begin));
    }
    begin = end;
  }
  if (ranked.size() > keep) ranked.resize(keep);
  return Status();
}

}  // namespace lode::rank
