#include "ranking/proximity.h"

#include <algorithm>
#include <cmath>

#include "ranking/scorer.h"

namespace lode::rank {

Proximity::Proximity(IndexReader& reader, const SearchOptions& options, const std::vector<ScoringTerm>& terms)
    : reader_(reader), options_(options), terms_(terms) {
  enabled_ = options.proximity.enabled && options.model == Model::kBm25;
  if (!enabled_) return;
  const CollectionStats stats = reader.stats();
  avg_length_ = stats.average_length(Field::kBody);
  const double n = static_cast<double>(stats.documents), k1 = options.bm25.k1;
  w_.assign(terms.size(), 0);
  cap_.assign(terms.size(), 0);
  cursors_.resize(terms.size());
  acc_.assign(terms.size(), 0);
  for (std::size_t i = 0; i < terms.size(); ++i) {
    const ScoringTerm& t = terms[i];
    if (t.field != Field::kBody || !t.info || t.info->df == 0) continue;
    // The paper's term weight log(N/N_t), natural log (the base is not
    // stated there; recalled from memory). It is 0 for a word in every document.
    w_[i] = std::log(std::max(1.0, n / static_cast<double>(t.info->df)));
    cap_[i] = std::min(1.0, w_[i]) * (k1 + 1.0);
  }
}

Status Proximity::positions(std::size_t i, DocId doc, std::vector<std::uint32_t>& out) {
  out.clear();
  auto& c = cursors_[i];
  if (!c || !c->valid() || c->doc() > doc) c = reader_.postings(*terms_[i].info);
  c->seek(doc);
  if (!c->status().ok()) return c->status();
  if (!c->valid() || c->doc() != doc) return Status();
  auto p = c->positions();
  if (!p) return p.status();
  out = std::move(p).value();
  return Status();
}

Status Proximity::add(DocId doc, const std::vector<std::uint32_t>& tfs, const DocNorms& norms, double& total,
                      std::vector<TermContribution>* out) {
  if (!enabled_) return Status();
  occurrences_.clear();
  std::size_t words = 0;
  for (std::size_t i = 0; i < terms_.size(); ++i) {
    if (tfs[i] == 0 || cap_[i] == 0) continue;
    LODE_RETURN_IF_ERROR(positions(i, doc, scratch_));
    for (std::uint32_t p : scratch_) occurrences_.emplace_back(p, i);
    ++words;
  }
  if (words < 2) return Status();  // proximity needs two different words
  std::sort(occurrences_.begin(), occurrences_.end());
  std::fill(acc_.begin(), acc_.end(), 0.0);
  // Neighbouring occurrences of different words (no query word between).
  for (std::size_t k = 1; k < occurrences_.size(); ++k) {
    const auto& [pa, a] = occurrences_[k - 1];
    const auto& [pb, b] = occurrences_[k];
    if (a == b || pb == pa) continue;
    const double d = static_cast<double>(pb - pa);
    acc_[a] += w_[b] / (d * d);
    acc_[b] += w_[a] / (d * d);
  }
  const double k1 = options_.bm25.k1;
  const std::uint32_t length = norms.length(doc, Field::kBody);
  const double big_k = k1 * bm25_length_norm(length, avg_length_, options_.bm25.b);
  for (std::size_t i = 0; i < terms_.size(); ++i) {
    if (acc_[i] <= 0) continue;
    const double weight = std::min(1.0, w_[i]);
    const double tf_part = acc_[i] * (k1 + 1.0) / (acc_[i] + big_k);
    const double contribution = weight * tf_part;
    total += contribution;
    if (out) {
      TermContribution c{terms_[i].term, Field::kBody, tfs[i], terms_[i].info->df, weight, length, avg_length_,
                         tf_part, 1.0, 1.0, contribution};
      c.proximity = true;
      out->push_back(std::move(c));
    }
  }
  return Status();
}

}  // namespace lode::rank
