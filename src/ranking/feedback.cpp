// RM3: relevance model over the feedback documents, mixed with the query.
#include "ranking/feedback.h"

#include <algorithm>
#include <map>
#include <unordered_map>

namespace lode::rank {
namespace {

// P(w|R) = sum_d P(d) * tf(w,d)/|d|, with P(d) proportional to the first-pass score.
Result<std::map<std::string, double>> relevance_model(IndexReader& reader, const std::vector<FeedbackDoc>& docs) {
  double total_score = 0;
  for (auto& d : docs) total_score += std::max(0.0, d.score);
  std::map<std::string, double> model;
  if (total_score <= 0) return model;
  std::unordered_map<TermId, std::string> names;  // title and body ids of one word differ
  for (auto& d : docs) {
    if (d.score <= 0) continue;
    std::map<std::string, double> tf;
    double length = 0;
    for (Field f : kAllFields) {
      auto fwd = reader.forward(d.doc, f);
      if (!fwd) return fwd.status();
      for (auto& [id, count] : *fwd) {
        auto it = names.find(id);
        if (it == names.end()) {
          auto info = reader.term_by_id(id);
          if (!info) return info.status();
          it = names.emplace(id, info->term).first;
        }
        tf[it->second] += count;
        length += count;
      }
    }
    if (length == 0) continue;
    for (auto& [word, count] : tf) model[word] += (d.score / total_score) * (count / length);
  }
  return model;
}

}  // namespace

Status expand_rm3(IndexReader& reader, const SearchOptions& options, const std::vector<FeedbackDoc>& docs,
                  std::vector<ScoringTerm>& terms) {
  auto model = relevance_model(reader, docs);
  if (!model) return model.status();
  if (model->empty()) return Status();
  // The `terms` most probable words (ties: alphabetical, for determinism), renormalised.
  std::vector<std::pair<std::string, double>> top(model->begin(), model->end());
  std::size_t keep = std::min(options.feedback.terms, top.size());
  std::partial_sort(top.begin(), top.begin() + static_cast<std::ptrdiff_t>(keep), top.end(),
                    [](auto& a, auto& b) { return a.second != b.second ? a.second > b.second : a.first < b.first; });
  top.resize(keep);
  double mass = 0;
  for (auto& [w, p] : top) mass += p;

  // |q|: the original query's words, each counted once whatever fields it is scored in.
  std::map<std::string, double> qtf;
  for (auto& t : terms) qtf[t.term] = std::max(qtf[t.term], t.qtf);
  double query_length = 0;
  for (auto& [w, n] : qtf) query_length += n;

  const double lambda = options.feedback.original_weight;
  std::map<std::pair<Field, std::string>, double> mixed;
  for (auto& t : terms) mixed[{t.field, t.term}] = lambda * t.qtf;
  for (auto& [word, p] : top)
    for (Field f : kAllFields)
      if (options.field_weight[static_cast<std::size_t>(f)] > 0)
        mixed[{f, word}] += (1 - lambda) * query_length * p / mass;

  std::vector<ScoringTerm> out;
  for (auto& [key, weight] : mixed) {
    if (weight <= 0) continue;  // lambda 0 drops original words the model does not hold
    ScoringTerm t;
    t.field = key.first;
    t.term = key.second;
    t.qtf = weight;
    auto info = reader.term(key.first, key.second);
    if (!info) return info.status();
    if (info->has_value() && (*info)->df > 0) t.info = **info;
    out.push_back(std::move(t));
  }
  terms = std::move(out);
  return Status();
}

}  // namespace lode::rank
