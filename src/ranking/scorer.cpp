#include "ranking/scorer.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace lode::rank {

Scorer::Scorer(IndexReader& reader, const SearchOptions& options, std::vector<ScoringTerm>& terms)
    : reader_(reader), options_(options), terms_(terms), stats_(reader.stats()), joint_(reader, options),
      proximity_(reader, options, terms) {
  if (auto n = reader.norms(); n.ok()) norms_ = *n;
  else status_ = n.status();
  auto n = static_cast<double>(stats_.documents);
  if (options.model == Model::kBm25) {
    for (auto& t : terms_) {
      t.df = t.info ? t.info->df : 0;
      t.query_weight = t.qtf;
    }
    if (options.fields == FieldScoring::kJoint && status_.ok()) status_ = group_fields();
    for (auto& t : terms_) t.idf = t.info ? bm25_idf(n, static_cast<double>(t.df)) : 0;
    const double k1 = options.bm25.k1, b = options.bm25.b;
    for (auto& t : terms_) {
      const double fw = options.field_weight[static_cast<std::size_t>(t.field)];
      const double avg = stats_.average_length(t.field);
      // BM25F's bound is qtf*idf*sat(x) = qtf*idf*(k1+1)*x/(x+k1); BM25's is
      // fw*qtf*idf*(k1+1)*tf/(tf+k1*B).
      const double scale = t.query_weight * t.idf * (k1 + 1.0) * (options.fields == FieldScoring::kSum ? fw : 1.0);
      fast_.push_back(FastBound{fw, avg > 0 ? 1.0 - b : 1.0, avg > 0 ? b / avg : 0.0, k1, scale});
    }
    if (options.fields == FieldScoring::kJoint) {
      group_scale_.assign(terms_.size(), 0.0);
      group_extra_.assign(terms_.size(), 0.0);
      for (std::size_t i = 0; i < terms_.size(); ++i) {
        group_scale_[terms_[i].group] = std::max(group_scale_[terms_[i].group], fast_[i].scale);
        group_extra_[terms_[i].group] += proximity_.bound(i);
      }
    }
    return;
  }
  if (joint_tfidf()) {
    if (status_.ok()) status_ = weigh_joint_query();
    group_scale_.assign(terms_.size(), 0.0);  // per group: the largest query weight
    for (std::size_t i = 0; i < terms_.size(); ++i)
      group_scale_[terms_[i].group] = std::max(group_scale_[terms_[i].group], terms_[i].query_weight);
    return;
  }
  // TF-IDF, fields summed: one query vector per field, normalised on its own.
  const SmartWeighting& w = options.smart;
  for (Field f : kAllFields) {
    double max_qtf = 0, sum_qtf = 0, count = 0, length = 0;
    for (auto& t : terms_)
      if (t.field == f) {
        max_qtf = std::max(max_qtf, t.qtf);
        sum_qtf += t.qtf;
        length += t.qtf;
        ++count;
      }
    double avg_qtf = count > 0 ? sum_qtf / count : 0;
    double sum_sq = 0;
    for (auto& t : terms_) {
      if (t.field != f) continue;
      t.df = t.info ? t.info->df : 0;
      double df = static_cast<double>(t.df);
      t.idf = smart_idf(w.query_idf, n, df, w.log_base);
      t.query_weight = df > 0 ? smart_tf(w.query_tf, t.qtf, max_qtf, avg_qtf, length, w.log_base) * t.idf : 0;
      sum_sq += t.query_weight * t.query_weight;
    }
    if (w.query_norm == 'c' && sum_sq > 0)
      for (auto& t : terms_)
        if (t.field == f) t.query_weight /= std::sqrt(sum_sq);
  }
}

// Joint TF-IDF: one query vector over words. A word's qtf is its largest over
// the fields it is searched in (a bare word counts once, not once per field),
// its idf from the documents with it in any weighted field; every (term,
// field) entry of the word carries the word's normalised weight.
Status Scorer::weigh_joint_query() {
  std::vector<std::string> words;
  for (auto& t : terms_) {
    auto it = std::find(words.begin(), words.end(), t.term);
    t.group = static_cast<std::size_t>(it - words.begin());
    if (it == words.end()) words.push_back(t.term);
  }
  const SmartWeighting& w = options_.smart;
  const double n = static_cast<double>(stats_.documents);
  std::vector<double> qtf(words.size(), 0), weight(words.size(), 0), idf(words.size(), 0);
  std::vector<std::uint64_t> df(words.size(), 0);
  for (std::size_t g = 0; g < words.size(); ++g) {
    std::optional<TermInfo> title, body;
    for (auto& t : terms_)
      if (t.group == g) {
        qtf[g] = std::max(qtf[g], t.qtf);
        if (t.info) (t.field == Field::kTitle ? title : body) = t.info;
      }
    auto d = joint_.word_df(title, body);
    if (!d) return d.status();
    df[g] = *d;
  }
  double max_qtf = 0, sum_qtf = 0;
  for (double q : qtf) max_qtf = std::max(max_qtf, q), sum_qtf += q;
  const double avg_qtf = words.empty() ? 0 : sum_qtf / static_cast<double>(words.size());
  double sum_sq = 0;
  for (std::size_t g = 0; g < words.size(); ++g) {
    idf[g] = smart_idf(w.query_idf, n, static_cast<double>(df[g]), w.log_base);
    weight[g] = df[g] > 0 ? smart_tf(w.query_tf, qtf[g], max_qtf, avg_qtf, sum_qtf, w.log_base) * idf[g] : 0;
    sum_sq += weight[g] * weight[g];
  }
  if (w.query_norm == 'c' && sum_sq > 0)
    for (double& x : weight) x /= std::sqrt(sum_sq);
  group_x_.assign(words.size(), 0);
  for (auto& t : terms_) {
    t.df = df[t.group];
    t.idf = idf[t.group];
    t.query_weight = weight[t.group];
  }
  return Status();
}

// Joint TF-IDF: the word's document weight smart_tf(x) * idf / norm, with
// x = sum of w_f * tf_f; entry (t, f) gets the share w_f * tf_f / x of it.
Result<double> Scorer::score_joint_tfidf(DocId doc, const std::vector<std::uint32_t>& tfs,
                                         std::vector<TermContribution>* out) {
  auto vec = joint_.stats(doc, *norms_);
  if (!vec) return vec.status();
  const SmartWeighting& w = options_.smart;
  const double n = static_cast<double>(stats_.documents);
  std::fill(group_x_.begin(), group_x_.end(), 0.0);
  for (std::size_t i = 0; i < terms_.size(); ++i)
    if (tfs[i] > 0) group_x_[terms_[i].group] += options_.field_weight[static_cast<std::size_t>(terms_[i].field)] * tfs[i];
  double total = 0;
  for (std::size_t i = 0; i < terms_.size(); ++i) {
    if (tfs[i] == 0) continue;
    const ScoringTerm& t = terms_[i];
    const double fw = options_.field_weight[static_cast<std::size_t>(t.field)];
    const double x = group_x_[t.group];
    const double doc_idf = smart_idf(w.doc_idf, n, static_cast<double>(t.df), w.log_base);
    const double weight = smart_tf(w.doc_tf, x, vec->max_tf, vec->avg_tf, vec->length, w.log_base) * doc_idf / vec->norm;
    const double tf_part = tfs[i] / x * weight;
    const double contribution = fw * t.query_weight * tf_part;
    total += contribution;
    if (out)
      out->push_back(TermContribution{t.term, t.field, tfs[i], t.df, t.idf, norms_->length(doc, t.field),
                                      stats_.average_length(t.field), tf_part, t.query_weight, fw, contribution});
  }
  return total;
}

// Terms of one word in several fields form a group; its df counts the live
// documents in the union of the fields' postings: |A| + |B| - |A and B|, with
// each field's live df from the index and the overlap from the reader
// (computed once per commit generation).
Status Scorer::group_fields() {
  static_assert(kFieldCount == 2, "the union below is of two fields");
  std::vector<std::string> words;
  for (auto& t : terms_) {
    auto it = std::find(words.begin(), words.end(), t.term);
    t.group = static_cast<std::size_t>(it - words.begin());
    if (it == words.end()) words.push_back(t.term);
  }
  group_x_.assign(words.size(), 0);
  for (std::size_t g = 0; g < words.size(); ++g) {
    std::vector<ScoringTerm*> members;
    for (auto& t : terms_)
      if (t.group == g && t.info) members.push_back(&t);
    if (members.size() < 2) continue;  // one field: its own df is the union
    auto both = reader_.live_overlap(members[0]->info->id, members[1]->info->id);
    if (!both) return both.status();
    const std::uint64_t df = members[0]->info->df + members[1]->info->df - *both;
    for (ScoringTerm* t : members) t->df = df;
  }
  return Status();
}

namespace {

// BM25's saturation of a (weighted, length-normalised) frequency x > 0.
double saturate(double x, double k1) { return x * (k1 + 1.0) / (x + k1); }

// SMART document tf weight's largest value for tf <= `tf` and length >= `length`:
// 'a' and 'b' never exceed 1, 'L' divides by 1 + log(avg tf) >= 1, 'r' is a share.
double smart_tf_bound(char letter, double tf, double length, double log_base) {
  switch (letter) {
    case 'a':
    case 'b': return 1.0;
    case 'L': return smart_tf('l', tf, 0, 0, 0, log_base);
    case 'r': return std::min(1.0, tf / length);
    default: return smart_tf(letter, tf, 0, 0, 0, log_base);
  }
}

}  // namespace

// BM25F: per group, x = sum of w_f * tf_f / B_f, one saturation; each entry
// gets the share of its group's part that its field brought to x.
double Scorer::score_joint(DocId doc, const std::vector<std::uint32_t>& tfs, std::vector<TermContribution>* out) {
  std::fill(group_x_.begin(), group_x_.end(), 0.0);
  std::vector<double>& norm = term_norm_;  // per term: tf_f / B_f
  norm.assign(terms_.size(), 0.0);
  for (std::size_t i = 0; i < terms_.size(); ++i) {
    if (tfs[i] == 0) continue;
    const ScoringTerm& t = terms_[i];
    double b_norm = bm25_length_norm(norms_->length(doc, t.field), stats_.average_length(t.field), options_.bm25.b);
    norm[i] = tfs[i] / b_norm;
    group_x_[t.group] += options_.field_weight[static_cast<std::size_t>(t.field)] * norm[i];
  }
  const double k1 = options_.bm25.k1;
  double total = 0;
  for (std::size_t i = 0; i < terms_.size(); ++i) {
    if (tfs[i] == 0) continue;
    const ScoringTerm& t = terms_[i];
    const double x = group_x_[t.group];
    const double fw = options_.field_weight[static_cast<std::size_t>(t.field)];
    const double tf_part = norm[i] / x * saturate(x, k1);
    const double contribution = fw * t.query_weight * t.idf * tf_part;
    total += contribution;
    if (out)
      out->push_back(TermContribution{t.term, t.field, tfs[i], t.df, t.idf, norms_->length(doc, t.field),
                                      stats_.average_length(t.field), tf_part, t.query_weight, fw, contribution});
  }
  return total;
}

// For 'l' tf with 'n' idf (lnc, the default), the other L - tf words of a
// field of length L weigh at least as much as one word of tf L - tf: with
// g(x) = (1 + log x)^2, concave for x >= 1 and g(1) = 1 >= g'(1) when the log
// base is at least e^2, g is subadditive over the other words' tfs. So
// norm^2 >= g(tf) + g(L - tf), and a word's share is at most
// sqrt(g(tf) / (g(tf) + g(L - tf))), rising with tf and falling with L.
// Any other weighting: 1.
double Scorer::cosine_share_bound(double tf, double length) const {
  const SmartWeighting& w = options_.smart;
  constexpr double kE2 = 7.38905609893065;  // e^2
  if (w.doc_tf != 'l' || w.doc_idf != 'n' || w.log_base < kE2 || length <= tf) return 1.0;
  const double a = smart_tf('l', tf, 0, 0, 0, w.log_base), b = smart_tf('l', length - tf, 0, 0, 0, w.log_base);
  return a / std::sqrt(a * a + b * b);
}

// A term's bound plus, for a body term present in a document, the bound of
// its proximity part (independent of tf and length).
double Scorer::bound(std::size_t i, double tf, double length) const {
  const double b = term_part_bound(i, tf, length);
  return tf > 0 && terms_[i].info ? b + proximity_.bound(i) : b;
}

// Every bound is monotone: up in tf, down in length; a field holding a term
// tf times is at least tf long, which keeps the bounds finite.
double Scorer::term_part_bound(std::size_t i, double tf, double length) const {
  const ScoringTerm& t = terms_[i];
  if (!t.info || tf <= 0) return 0;
  length = std::max(length, tf);
  if (!fast_.empty()) {  // BM25: the constants below, worked out once per query
    const FastBound& f = fast_[i];
    const double norm = f.one_minus_b + f.b_over_avg * length;  // bm25_length_norm
    if (options_.fields == FieldScoring::kSum) return f.scale * tf / (tf + f.k1 * norm);
    // BM25F: an entry's share w*tf/B / x of its group's qtf * idf * sat(x)
    // is at most qtf * idf * sat(w*tf/B), since sat(x)/x falls as x grows.
    // (B > 0: length >= tf >= 1.)
    const double x = f.fw * tf / norm;
    return x > 0 ? f.scale * x / (x + f.k1) : 0;
  }
  const double fw = options_.field_weight[static_cast<std::size_t>(t.field)];
  const double avg = stats_.average_length(t.field);
  if (options_.model == Model::kBm25) {
    if (options_.fields == FieldScoring::kSum) return fw * t.query_weight * t.idf * bm25_tf_part(tf, length, avg, options_.bm25);
    // BM25F: an entry's share w*tf/B / x of its group's qtf * idf * sat(x)
    // is at most qtf * idf * sat(w*tf/B), since sat(x)/x falls as x grows.
    // (B > 0: length >= tf >= 1.)
    const double x = fw * tf / bm25_length_norm(length, avg, options_.bm25.b);
    return x > 0 ? t.query_weight * t.idf * saturate(x, options_.bm25.k1) : 0;
  }
  const SmartWeighting& w = options_.smart;
  // Joint TF-IDF: an entry is w_f * tf_f / x (<= 1) of its word's q * weight,
  // and a cosine-normalised weight is at most 1. Other document norms have no
  // bound from one field's tf: no pruning (still exact).
  if (joint_tfidf())
    return w.doc_norm == 'c' ? t.query_weight : std::numeric_limits<double>::infinity();
  // A cosine-normalised weight is a unit vector's component: at most 1.
  if (w.doc_norm == 'c') return fw * t.query_weight * cosine_share_bound(tf, length);
  const double doc_idf = smart_idf(w.doc_idf, static_cast<double>(stats_.documents), static_cast<double>(t.df), w.log_base);
  return fw * t.query_weight * smart_tf_bound(w.doc_tf, tf, length, w.log_base) * doc_idf;
}

std::size_t Scorer::group(std::size_t i) const {
  return options_.fields == FieldScoring::kJoint ? terms_[i].group : i;
}

bool Scorer::joint() const { return !fast_.empty() && options_.fields == FieldScoring::kJoint; }

// Joint BM25: w*tf/B. Joint TF-IDF: presence (the word's share of its
// cosine-normalised weight is bounded whatever its tf). Otherwise the bound.
double Scorer::member_raw(std::size_t i, std::uint32_t tf, std::uint32_t length) const {
  if (!joint() && !joint_tfidf()) return bound(i, tf, length);
  if (!terms_[i].info || tf == 0) return 0;
  if (joint_tfidf()) return 1.0;
  const FastBound& f = fast_[i];
  const double len = std::max<double>(length, tf);  // a field holding tf words is at least tf long
  return f.fw * tf / (f.one_minus_b + f.b_over_avg * len);
}

double Scorer::doc_raw(std::size_t i, std::uint32_t tf, DocId doc) const {
  return member_raw(i, tf, norms_->length(doc, terms_[i].field));
}

// Joint BM25: max qtf*idf*sat(x), plus the members' proximity parts. Joint
// TF-IDF: a word's entries share one weight of at most its query weight q
// when documents are cosine-normalised, and have no bound otherwise.
double Scorer::group_bound(std::size_t g, double raw) const {
  if (!joint() && !joint_tfidf()) return raw;
  if (raw <= 0) return 0;
  if (joint_tfidf())
    return options_.smart.doc_norm == 'c' ? group_scale_[g] : std::numeric_limits<double>::infinity();
  return group_scale_[g] * raw / (raw + options_.bm25.k1) + group_extra_[g];
}

double Scorer::term_bound(std::size_t i) const {
  return terms_[i].info ? bound(i, static_cast<double>(terms_[i].info->cf), 0) : 0;
}

double Scorer::block_bound(std::size_t i, std::uint32_t tf, std::uint32_t length) const {
  return bound(i, tf, length);
}

double Scorer::doc_bound(std::size_t i, std::uint32_t tf, DocId doc) const {
  return bound(i, tf, norms_->length(doc, terms_[i].field));
}

Result<std::uint64_t> Scorer::df_of(TermId id) {
  auto it = df_cache_.find(id);
  if (it != df_cache_.end()) return it->second;
  auto info = reader_.term_by_id(id);
  if (!info) return info.status();
  df_cache_.emplace(id, info->df);
  return info->df;
}

// Norm, max tf and average tf of a document field's SMART vector, from the
// forward index (so any document-side weighting works without re-indexing).
Result<Scorer::DocVector> Scorer::doc_vector(DocId doc, Field field) {
  const SmartWeighting& w = options_.smart;
  DocVector v;
  auto fwd = reader_.forward(doc, field);
  if (!fwd) return fwd.status();
  double sum_tf = 0, length = norms_->length(doc, field);
  for (auto& [id, tf] : *fwd) {
    v.max_tf = std::max(v.max_tf, static_cast<double>(tf));
    sum_tf += tf;
  }
  v.avg_tf = fwd->empty() ? 0 : sum_tf / static_cast<double>(fwd->size());
  if (w.doc_norm != 'c') return v;
  double n = static_cast<double>(stats_.documents), sum_sq = 0;
  for (auto& [id, tf] : *fwd) {
    double idf = 1;
    if (w.doc_idf != 'n') {
      auto df = df_of(id);
      if (!df) return df.status();
      idf = smart_idf(w.doc_idf, n, static_cast<double>(*df), w.log_base);
    }
    double x = smart_tf(w.doc_tf, tf, v.max_tf, v.avg_tf, length, w.log_base) * idf;
    sum_sq += x * x;
  }
  v.norm = sum_sq > 0 ? std::sqrt(sum_sq) : 1;
  return v;
}

Result<double> Scorer::score(DocId doc, const std::vector<std::uint32_t>& tfs,
                             std::vector<TermContribution>* out) {
  auto total = score_terms(doc, tfs, out);
  if (!total || !proximity_.enabled()) return total;
  double sum = *total;
  LODE_RETURN_IF_ERROR(proximity_.add(doc, tfs, *norms_, sum, out));
  return sum;
}

Result<double> Scorer::score_terms(DocId doc, const std::vector<std::uint32_t>& tfs,
                                   std::vector<TermContribution>* out) {
  LODE_RETURN_IF_ERROR(status_);
  if (options_.model == Model::kBm25 && options_.fields == FieldScoring::kJoint) return score_joint(doc, tfs, out);
  if (joint_tfidf()) return score_joint_tfidf(doc, tfs, out);
  double total = 0;
  std::optional<DocVector> vec[kFieldCount];
  const bool bm25 = options_.model == Model::kBm25;
  const SmartWeighting& w = options_.smart;
  double n = static_cast<double>(stats_.documents);
  for (std::size_t i = 0; i < terms_.size(); ++i) {
    if (tfs[i] == 0) continue;
    const ScoringTerm& t = terms_[i];
    auto fi = static_cast<std::size_t>(t.field);
    double fw = options_.field_weight[fi];
    std::uint32_t len = norms_->length(doc, t.field);
    double avg = stats_.average_length(t.field);
    double tf_part, contribution;
    if (bm25) {
      tf_part = bm25_tf_part(tfs[i], len, avg, options_.bm25);
      contribution = fw * t.query_weight * t.idf * tf_part;
    } else {
      if (!vec[fi]) {
        auto v = doc_vector(doc, t.field);
        if (!v) return v.status();
        vec[fi] = *v;
      }
      double df = static_cast<double>(t.df);
      double doc_idf = smart_idf(w.doc_idf, n, df, w.log_base);
      tf_part = smart_tf(w.doc_tf, tfs[i], vec[fi]->max_tf, vec[fi]->avg_tf, len, w.log_base) * doc_idf /
                vec[fi]->norm;
      contribution = fw * t.query_weight * tf_part;
    }
    total += contribution;
    if (out)
      out->push_back(TermContribution{t.term, t.field, tfs[i], t.df, t.idf, len, avg, tf_part,
                                      t.query_weight, fw, contribution});
  }
  return total;
}

}  // namespace lode::rank
