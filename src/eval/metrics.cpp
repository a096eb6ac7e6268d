// Per-query ranking metrics and their means (definitions in docs/evaluation.md).
#include <algorithm>
#include <cmath>

#include "lode/eval.h"

namespace lode {
namespace {

int grade_of(const std::map<std::string, int>& judged, const std::string& doc) {
  auto it = judged.find(doc);
  return it == judged.end() ? 0 : it->second;
}

std::size_t relevant_count(const std::map<std::string, int>& judged) {
  return static_cast<std::size_t>(
      std::count_if(judged.begin(), judged.end(), [](auto& kv) { return kv.second > 0; }));
}

std::size_t relevant_in_top(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged,
                            std::size_t k) {
  std::size_t hits = 0;
  for (std::size_t i = 0; i < ranked.size() && i < k; ++i) hits += grade_of(judged, ranked[i]) > 0;
  return hits;
}

double discount(std::size_t rank0) { return std::log2(static_cast<double>(rank0) + 2.0); }

}  // namespace

double average_precision(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged) {
  std::size_t rel = relevant_count(judged);
  if (rel == 0) return 0;
  double sum = 0;
  std::size_t found = 0;
  for (std::size_t i = 0; i < ranked.size(); ++i)
    if (grade_of(judged, ranked[i]) > 0) sum += static_cast<double>(++found) / static_cast<double>(i + 1);
  return sum / static_cast<double>(rel);
}

double ndcg_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged, std::size_t k) {
  double dcg = 0;
  for (std::size_t i = 0; i < ranked.size() && i < k; ++i) {
    int g = grade_of(judged, ranked[i]);
    if (g > 0) dcg += g / discount(i);
  }
  std::vector<int> ideal;
  for (auto& [doc, g] : judged)
    if (g > 0) ideal.push_back(g);
  std::sort(ideal.rbegin(), ideal.rend());
  double idcg = 0;
  for (std::size_t i = 0; i < ideal.size() && i < k; ++i) idcg += ideal[i] / discount(i);
  return idcg > 0 ? dcg / idcg : 0;
}

double precision_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged, std::size_t k) {
  if (k == 0) return 0;
  return static_cast<double>(relevant_in_top(ranked, judged, k)) / static_cast<double>(k);
}

double recall_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged, std::size_t k) {
  std::size_t rel = relevant_count(judged);
  if (rel == 0) return 0;
  return static_cast<double>(relevant_in_top(ranked, judged, k)) / static_cast<double>(rel);
}

double r_precision(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged) {
  return precision_at(ranked, judged, relevant_count(judged));
}

double reciprocal_rank(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged) {
  for (std::size_t i = 0; i < ranked.size(); ++i)
    if (grade_of(judged, ranked[i]) > 0) return 1.0 / static_cast<double>(i + 1);
  return 0;
}

std::array<double, 11> interpolated_precision(const std::vector<std::string>& ranked,
                                              const std::map<std::string, int>& judged) {
  std::array<double, 11> out{};
  std::size_t rel = relevant_count(judged);
  if (rel == 0) return out;
  std::size_t found = 0;
  for (std::size_t i = 0; i < ranked.size(); ++i) {
    if (grade_of(judged, ranked[i]) <= 0) continue;
    ++found;
    double p = static_cast<double>(found) / static_cast<double>(i + 1);
    // Recall found/rel reaches level j/10 when 10*found >= j*rel (integers: no rounding at the boundary).
    for (std::size_t j = 0; j <= 10; ++j)
      if (10 * found >= j * rel) out[j] = std::max(out[j], p);
  }
  return out;
}

std::size_t judged_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged,
                      std::size_t k) {
  std::size_t n = 0;
  for (std::size_t i = 0; i < ranked.size() && i < k; ++i) n += judged.count(ranked[i]);
  return n;
}

namespace {

std::vector<std::string> ranked_ids(const Run& run, const std::string& qid, std::size_t depth) {
  std::vector<std::string> ranked;
  if (auto it = run.find(qid); it != run.end())
    for (std::size_t i = 0; i < it->second.size() && i < depth; ++i) ranked.push_back(it->second[i].docid);
  return ranked;
}

QueryScores score_query(const std::string& qid, const std::vector<std::string>& ranked,
                        const std::map<std::string, int>& judged, const EvalOptions& o) {
  QueryScores s;
  s.qid = qid;
  s.ap = average_precision(ranked, judged);
  s.ndcg10 = ndcg_at(ranked, judged, 10);
  s.p10 = precision_at(ranked, judged, 10);
  s.rprec = r_precision(ranked, judged);
  s.rr = reciprocal_rank(ranked, judged);
  s.recall1000 = recall_at(ranked, judged, 1000);
  s.ndcg_k = ndcg_at(ranked, judged, o.k);
  s.p_k = precision_at(ranked, judged, o.k);
  s.recall_depth = recall_at(ranked, judged, o.depth);
  auto judged_k = judged_at(ranked, judged, o.k);
  s.judged_k = static_cast<double>(judged_k);
  s.unjudged_k = static_cast<double>(std::min(ranked.size(), o.k) - judged_k);
  s.relevant = static_cast<double>(relevant_count(judged));
  s.retrieved = static_cast<double>(ranked.size());
  s.relevant_retrieved = static_cast<double>(relevant_in_top(ranked, judged, ranked.size()));
  s.interpolated = interpolated_precision(ranked, judged);
  return s;
}

// Adds x / n to every averaged field of `mean`.
void accumulate(QueryScores& mean, const QueryScores& x, double n) {
  double* const dst[] = {&mean.ap, &mean.ndcg10, &mean.p10, &mean.rprec, &mean.rr, &mean.recall1000,
                         &mean.ndcg_k, &mean.p_k, &mean.recall_depth, &mean.judged_k, &mean.unjudged_k,
                         &mean.relevant, &mean.retrieved, &mean.relevant_retrieved};
  const double src[] = {x.ap, x.ndcg10, x.p10, x.rprec, x.rr, x.recall1000, x.ndcg_k, x.p_k, x.recall_depth,
                        x.judged_k, x.unjudged_k, x.relevant, x.retrieved, x.relevant_retrieved};
  for (std::size_t i = 0; i < std::size(src); ++i) *dst[i] += src[i] / n;
  for (std::size_t j = 0; j < x.interpolated.size(); ++j) mean.interpolated[j] += x.interpolated[j] / n;
}

}  // namespace

Evaluation evaluate(const Run& run, const Qrels& qrels, const EvalOptions& options) {
  Evaluation ev;
  ev.options = options;
  ev.mean.qid = "all";
  for (auto& [qid, judged] : qrels) {
    if (relevant_count(judged) == 0) continue;
    ev.per_query.push_back(score_query(qid, ranked_ids(run, qid, options.depth), judged, options));
  }
  for (auto& [qid, entries] : run) {
    auto it = qrels.find(qid);
    if (it == qrels.end() || relevant_count(it->second) == 0) ev.unjudged.push_back(qid);
  }
  double n = static_cast<double>(ev.per_query.size());
  for (auto& s : ev.per_query) accumulate(ev.mean, s, n);
  return ev;
}

std::vector<std::pair<std::string, double>> per_query_metric(const Run& run, const Qrels& qrels, const Metric& m,
                                                             const EvalOptions& options) {
  std::vector<std::pair<std::string, double>> out;
  std::size_t k = m.k ? m.k : (m.kind == MetricKind::kRecall ? options.depth : options.k);
  for (auto& [qid, judged] : qrels) {
    if (relevant_count(judged) == 0) continue;
    auto ranked = ranked_ids(run, qid, options.depth);
    double v = 0;
    switch (m.kind) {
      case MetricKind::kAp: v = average_precision(ranked, judged); break;
      case MetricKind::kNdcg: v = ndcg_at(ranked, judged, k); break;
      case MetricKind::kPrecision: v = precision_at(ranked, judged, k); break;
      case MetricKind::kRecall: v = recall_at(ranked, judged, k); break;
      case MetricKind::kRPrecision: v = r_precision(ranked, judged); break;
      case MetricKind::kReciprocalRank: v = reciprocal_rank(ranked, judged); break;
    }
    out.emplace_back(qid, v);
  }
  return out;
}

}  // namespace lode
