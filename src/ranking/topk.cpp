// top_k over owned cursors and virtual model calls (the walk is in lode/topk.h).
#include "lode/topk.h"

namespace lode {

Result<TopKResult> top_k(std::vector<std::unique_ptr<PostingCursor>>& cursors, TopKModel& model, std::size_t k,
                         bool count_all) {
  std::vector<PostingCursor*> raw;
  raw.reserve(cursors.size());
  for (auto& c : cursors) raw.push_back(c.get());
  return top_k_walk<TopKModel>(raw, model, k, count_all);
}

}  // namespace lode
