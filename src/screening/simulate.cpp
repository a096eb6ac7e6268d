// A reviewer played by known judgments (lode/screening.h): the measure of
// docs/screening.md and bench/screening.
#include <algorithm>
#include <cmath>
#include <unordered_set>

#include "lode/screening.h"

namespace lode {

std::size_t read_to_recall(const std::vector<bool>& order, std::size_t relevant, double r) {
  if (relevant == 0) return 0;
  // The smallest count of relevant documents whose share reaches r.
  auto need = static_cast<std::size_t>(std::ceil(r * static_cast<double>(relevant) - 1e-9));
  std::size_t found = 0;
  for (std::size_t i = 0; i < order.size(); ++i) {
    found += order[i] ? 1 : 0;
    if (found >= need) return i + 1;
  }
  return 0;
}

std::size_t SimulationRun::to_recall(double r) const { return read_to_recall(order, relevant, r); }

Result<SimulationRun> simulate_sift(IndexReader& reader, std::string_view query, const std::vector<DocId>& relevant,
                                    const SiftOptions& options, const KneeOptions& knee) {
  auto engine = SiftEngine::create(reader, query, live_documents(reader), options);
  if (!engine) return engine.status();
  SiftEngine& e = **engine;
  std::unordered_set<DocId> wanted;
  for (DocId d : relevant)
    if (reader.live(d)) wanted.insert(d);
  SimulationRun run;
  run.scope = e.scope_size();
  run.relevant = wanted.size();
  std::size_t found = 0;
  // Past full recall nothing more is learnt: whether the rule stopped before
  // 80, 95 or 100 % is known by then.
  for (std::size_t round = 0; e.unjudged() > 0 && found < run.relevant; ++round) {
    auto batch = e.rank(options.batch_size(round), round);
    if (!batch) return batch.status();
    for (const RankedDoc& r : *batch) {
      bool rel = wanted.count(r.doc) > 0;
      e.judge(r.doc, rel);
      run.order.push_back(rel);
      found += rel ? 1 : 0;
    }
    // The rule is consulted after each batch, as a reviewer would.
    if (run.knee_stop == 0 && knee_check(run.order, knee).stop) run.knee_stop = run.order.size();
  }
  return run;
}

}  // namespace lode
