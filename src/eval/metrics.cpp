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
    if (g > 0) dcg += g / std::log2(static_cast<double>(i) + 2.0);
  }
  std::vector<int> ideal;
  for (auto& [doc, g] : judged)
    if (g > 0) ideal.push_back(g);
  std::sort(ideal.rbegin(), ideal.rend());
  double idcg = 0;
  for (std::size_t i = 0; i < ideal.size() && i < k; ++i) idcg += ideal[i] / std::log2(static_cast<double>(i) + 2.0);
  return idcg > 0 ? dcg / idcg : 0;
}

double precision_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged, std::size_t k) {
  if (k == 0) return 0;
  std::size_t hits = 0;
  for (std::size_t i = 0; i < ranked.size() && i < k; ++i) hits += grade_of(judged, ranked[i]) > 0;
  return static_cast<double>(hits) / static_cast<double>(k);
}

double recall_at(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged, std::size_t k) {
  std::size_t rel = relevant_count(judged);
  if (rel == 0) return 0;
  std::size_t hits = 0;
  for (std::size_t i = 0; i < ranked.size() && i < k; ++i) hits += grade_of(judged, ranked[i]) > 0;
  return static_cast<double>(hits) / static_cast<double>(rel);
}

double r_precision(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged) {
  return precision_at(ranked, judged, relevant_count(judged));
}

double reciprocal_rank(const std::vector<std::string>& ranked, const std::map<std::string, int>& judged) {
  for (std::size_t i = 0; i < ranked.size(); ++i)
    if (grade_of(judged, ranked[i]) > 0) return 1.0 / static_cast<double>(i + 1);
  return 0;
}

Evaluation evaluate(const Run& run, const Qrels& qrels) {
  Evaluation ev;
  ev.mean.qid = "all";
  for (auto& [qid, judged] : qrels) {
    if (relevant_count(judged) == 0) continue;
    std::vector<std::string> ranked;
    if (auto it = run.find(qid); it != run.end())
      for (auto& e : it->second) ranked.push_back(e.docid);
    QueryScores s{qid,
                  average_precision(ranked, judged),
                  ndcg_at(ranked, judged, 10),
                  precision_at(ranked, judged, 10),
                  r_precision(ranked, judged),
                  reciprocal_rank(ranked, judged),
                  recall_at(ranked, judged, 1000)};
    ev.per_query.push_back(s);
  }
  for (auto& [qid, entries] : run)
    if (!qrels.count(qid)) ev.unjudged.push_back(qid);
  if (!ev.per_query.empty()) {
    double n = static_cast<double>(ev.per_query.size());
    for (auto& s : ev.per_query) {
      ev.mean.ap += s.ap / n;
      ev.mean.ndcg10 += s.ndcg10 / n;
      ev.mean.p10 += s.p10 / n;
      ev.mean.rprec += s.rprec / n;
      ev.mean.rr += s.rr / n;
      ev.mean.recall1000 += s.recall1000 / n;
    }
  }
  return ev;
}

}  // namespace lode
