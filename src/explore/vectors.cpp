// Document and passage vectors from the forward index (see lode/vectors.h).
#include <algorithm>
#include <cmath>
#include <map>

#include "explore/letters.h"
#include "explore/top_n.h"

#include "lode/ranking.h"
#include "lode/vectors.h"

namespace lode {

Status VectorOptions::check() const {
  LODE_RETURN_IF_ERROR(explore::check_letters(tf, idf, log_base, "vector"));
  for (double w : field_weight)
    if (!(w >= 0) || w > 1e6) return Status::InvalidArgument("field weights must be between 0 and 1e6");
  if (field_weight[0] == 0 && field_weight[1] == 0)
    return Status::InvalidArgument("at least one field weight must be above 0");
  return Status();
}

double cosine(const SparseVector& a, const SparseVector& b) {
  double dot = 0;
  std::size_t i = 0, j = 0;
  while (i < a.size() && j < b.size()) {
    if (a[i].term < b[j].term) ++i;
    else if (b[j].term < a[i].term) ++j;
    else dot += a[i++].weight * b[j++].weight;
  }
  return dot;
}

SparseVector heaviest(const SparseVector& v, std::size_t n) {
  SparseVector out = v;
  auto heavier = [](const TermWeight& x, const TermWeight& y) {
    return x.weight != y.weight ? x.weight > y.weight : x.term < y.term;
  };
  explore::keep_top(out, n, heavier);
  return out;
}

VectorSource::VectorSource(IndexReader& reader, const VectorOptions& options)
    : reader_(reader), options_(options), n_docs_(static_cast<double>(reader.stats().documents)) {}

Result<const TermInfo*> VectorSource::term(TermId id) {
  auto it = terms_.find(id);
  if (it != terms_.end()) return &it->second;
  auto info = reader_.term_by_id(id);
  if (!info) return info.status();
  return &terms_.emplace(id, std::move(info.value())).first->second;
}

std::vector<DocId> live_documents(IndexReader& reader) {
  std::vector<DocId> out;
  for (DocId d = 1; d < reader.doc_id_limit(); ++d)
    if (reader.live(d)) out.push_back(d);
  return out;
}

// Appends one field's weighted entries (unnormalised) to `out`.
Status VectorSource::weigh(const std::vector<std::pair<TermId, std::uint32_t>>& tfs, Field field,
                           double length, SparseVector& out) {
  double fw = options_.field_weight[static_cast<std::size_t>(field)];
  if (fw == 0 || tfs.empty()) return Status();
  double max_tf = 0, sum_tf = 0;
  for (auto& [id, tf] : tfs) {
    max_tf = std::max(max_tf, static_cast<double>(tf));
    sum_tf += tf;
  }
  double avg_tf = sum_tf / static_cast<double>(tfs.size());
  for (auto& [id, tf] : tfs) {
    auto info = term(id);
    if (!info) return info.status();
    double df = static_cast<double>((*info)->df);
    double w = fw * smart_tf(options_.tf, tf, max_tf, avg_tf, length, options_.log_base) *
               smart_idf(options_.idf, n_docs_, df, options_.log_base);
    if (w > 0) out.push_back({id, w});
  }
  return Status();
}

namespace {
void finish(SparseVector& v) {
  std::sort(v.begin(), v.end(), [](const TermWeight& a, const TermWeight& b) { return a.term < b.term; });
  double sq = 0;
  for (auto& e : v) sq += e.weight * e.weight;
  if (sq <= 0) return v.clear();
  double norm = std::sqrt(sq);
  for (auto& e : v) e.weight /= norm;
}
}  // namespace

Result<SparseVector> VectorSource::document(DocId doc) {
  if (!reader_.live(doc)) return Status::NotFound("document " + std::to_string(doc) + " is not in the index");
  SparseVector v;
  for (Field f : kAllFields) {
    if (options_.field_weight[static_cast<std::size_t>(f)] == 0) continue;
    auto fwd = reader_.forward(doc, f);
    if (!fwd) return fwd.status();
    LODE_RETURN_IF_ERROR(weigh(*fwd, f, reader_.length(doc, f), v));
  }
  finish(v);
  return v;
}

Result<SparseVector> VectorSource::passage(std::string_view text, Analyzer& analyzer) {
  Utf8Repair clean = repair_utf8(text);
  auto analyzed = analyzer.analyze(clean.text);
  std::map<std::string, std::uint32_t> counts;
  for (auto& t : analyzed.tokens) ++counts[t.term];
  double length = static_cast<double>(analyzed.tokens.size());
  SparseVector v;
  for (Field f : kAllFields) {
    if (options_.field_weight[static_cast<std::size_t>(f)] == 0) continue;
    std::vector<std::pair<TermId, std::uint32_t>> tfs;
    for (auto& [word, tf] : counts) {
      auto info = reader_.term(f, word);
      if (!info) return info.status();
      if (!*info || (*info)->df == 0) continue;
      terms_.emplace((*info)->id, **info);
      tfs.emplace_back((*info)->id, tf);
    }
    LODE_RETURN_IF_ERROR(weigh(tfs, f, length, v));
  }
  finish(v);
  return v;
}

}  // namespace lode
