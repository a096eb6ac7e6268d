#include "ranking/joint_vector.h"

#include <algorithm>
#include <cmath>

namespace lode::rank {

Result<std::uint64_t> JointVectors::word_df(const std::optional<TermInfo>& title, const std::optional<TermInfo>& body) {
  const bool use_title = title && options_.field_weight[static_cast<std::size_t>(Field::kTitle)] > 0;
  const bool use_body = body && options_.field_weight[static_cast<std::size_t>(Field::kBody)] > 0;
  if (use_title && use_body) {
    auto both = reader_.live_overlap(title->id, body->id);
    if (!both) return both.status();
    return title->df + body->df - *both;
  }
  if (use_title) return title->df;
  if (use_body) return body->df;
  return std::uint64_t{0};
}

Result<TermId> JointVectors::word_key(TermId id, Field field) {
  if (field == Field::kBody) return id;
  if (auto it = key_.find(id); it != key_.end()) return it->second;
  auto info = reader_.term_by_id(id);
  if (!info) return info.status();
  auto body = reader_.term(Field::kBody, info->term);
  if (!body) return body.status();
  const TermId key = *body ? (**body).id : id;
  key_.emplace(id, key);
  return key;
}

Result<std::uint64_t> JointVectors::key_df(TermId key) {
  if (auto it = df_.find(key); it != df_.end()) return it->second;
  auto info = reader_.term_by_id(key);
  if (!info) return info.status();
  std::optional<TermInfo> title, body;
  (info->field == Field::kBody ? body : title) = *info;
  if (info->field == Field::kBody) {
    auto t = reader_.term(Field::kTitle, info->term);
    if (!t) return t.status();
    title = *t;
  }
  auto df = word_df(title, body);
  if (!df) return df.status();
  df_.emplace(key, *df);
  return *df;
}

Result<JointStats> JointVectors::stats(DocId doc, const DocNorms& norms) {
  const SmartWeighting& w = options_.smart;
  JointStats s;
  merged_.clear();
  for (Field f : kAllFields) {
    const double fw = options_.field_weight[static_cast<std::size_t>(f)];
    if (fw == 0) continue;
    s.length += fw * norms.length(doc, f);
    auto fwd = reader_.forward(doc, f);
    if (!fwd) return fwd.status();
    for (auto& [id, tf] : *fwd) {
      auto key = word_key(id, f);
      if (!key) return key.status();
      merged_.emplace_back(*key, fw * tf);
    }
  }
  // The same word from both fields: one entry with the summed tf.
  std::sort(merged_.begin(), merged_.end());
  std::size_t out = 0;
  for (std::size_t i = 0; i < merged_.size(); ++i) {
    if (out > 0 && merged_[out - 1].first == merged_[i].first) merged_[out - 1].second += merged_[i].second;
    else merged_[out++] = merged_[i];
  }
  merged_.resize(out);
  double sum_tf = 0;
  for (auto& [key, tf] : merged_) {
    s.max_tf = std::max(s.max_tf, tf);
    sum_tf += tf;
  }
  s.avg_tf = merged_.empty() ? 0 : sum_tf / static_cast<double>(merged_.size());
  if (w.doc_norm != 'c') return s;
  const double n = static_cast<double>(reader_.stats().documents);
  double sum_sq = 0;
  for (auto& [key, tf] : merged_) {
    double idf = 1;
    if (w.doc_idf != 'n') {
      auto df = key_df(key);
      if (!df) return df.status();
      idf = smart_idf(w.doc_idf, n, static_cast<double>(*df), w.log_base);
    }
    const double x = smart_tf(w.doc_tf, tf, s.max_tf, s.avg_tf, s.length, w.log_base) * idf;
    sum_sq += x * x;
  }
  s.norm = sum_sq > 0 ? std::sqrt(sum_sq) : 1;
  return s;
}

}  // namespace lode::rank
