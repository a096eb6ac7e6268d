// Per-query scoring state: one entry per (term, field) the query ranks by,
// with its collection statistics and query-side weight. The same score()
// computes ranking scores and breakdowns, so the two always agree.
#pragma once

#include <span>
#include <unordered_map>
#include <vector>

#include "lode/index.h"
#include "lode/ranking.h"
#include "ranking/joint_vector.h"
#include "ranking/proximity.h"

namespace lode::rank {

struct ScoringTerm {
  std::string term;
  Field field = Field::kBody;
  std::optional<TermInfo> info;  // nullopt: not in the index
  double qtf = 0;                // occurrences in the query
  std::uint64_t df = 0;          // df behind idf: the field's; joint BM25: documents with the term in any field
  std::size_t group = 0;         // joint fields: index of the term's group (same word, any field)
  double idf = 0;                // BM25 idf, or the query-side SMART idf
  double query_weight = 0;       // BM25: qtf; TF-IDF: normalised query weight
};

class Scorer {
 public:
  // Fills idf, df and query_weight of `terms` for the chosen model. Index
  // read errors while doing so are returned by every score() call.
  Scorer(IndexReader& reader, const SearchOptions& options, std::vector<ScoringTerm>& terms);

  // Score of `doc` where tfs[i] is the tf of terms[i] in it (0 = absent).
  // When `out` is given, appends one entry per term with tf > 0, in term
  // order, then the proximity rows (ranking/proximity.h) when it is on.
  Result<double> score(DocId doc, const std::vector<std::uint32_t>& tfs,
                       std::vector<TermContribution>* out);

  // Upper bounds of terms[i]'s contribution (its breakdown entry), for
  // pruning (lode/topk.h): to any document; to one with tf <= max_tf and
  // field length >= min_length; to `doc`, where its tf is `tf`.
  double term_bound(std::size_t i) const;
  double block_bound(std::size_t i, std::uint32_t tf, std::uint32_t length) const;
  double doc_bound(std::size_t i, std::uint32_t tf, DocId doc) const;
  // Groups for lode/topk.h: joint fields group a word's entries. Joint BM25:
  // they share one saturation, a member's raw amount is its w*tf/B, and a
  // group's total is at most max qtf * idf * sat(x) for x the sum of its
  // members' amounts, plus their proximity parts. Joint TF-IDF: a member's
  // raw amount is its presence, and a group's total is at most its query
  // weight (cosine-normalised documents). Summed fields leave every term
  // alone (raw amount = bound, identity).
  std::size_t group(std::size_t i) const;
  double member_raw(std::size_t i, std::uint32_t tf, std::uint32_t length) const;
  double doc_raw(std::size_t i, std::uint32_t tf, DocId doc) const;
  double group_bound(std::size_t g, double raw) const;

 private:
  struct DocVector {
    double norm = 1, max_tf = 0, avg_tf = 0;
  };
  Result<DocVector> doc_vector(DocId doc, Field field);
  // score() without the proximity parts.
  Result<double> score_terms(DocId doc, const std::vector<std::uint32_t>& tfs, std::vector<TermContribution>* out);
  // bound() without the proximity part.
  double term_part_bound(std::size_t i, double tf, double length) const;
  Result<std::uint64_t> df_of(TermId id);
  // Joint BM25: groups terms by word and gives each group its any-field df.
  Status group_fields();
  // Bound for tf <= `tf` and field length >= `length`.
  double bound(std::size_t i, double tf, double length) const;
  // BM25 with joint fields: the fast_ constants and group_scale_ are set.
  bool joint() const;
  // Bound of a cosine-normalised document weight (<= 1) for those tf and length.
  double cosine_share_bound(double tf, double length) const;
  double score_joint(DocId doc, const std::vector<std::uint32_t>& tfs, std::vector<TermContribution>* out);
  // TF-IDF over one joint vector (ranking/joint_vector.h): the query vector
  // per word, and a document's score split over its (term, field) entries.
  Status weigh_joint_query();
  Result<double> score_joint_tfidf(DocId doc, const std::vector<std::uint32_t>& tfs,
                                   std::vector<TermContribution>* out);
  bool joint_tfidf() const { return options_.model == Model::kTfIdf && options_.fields == FieldScoring::kJoint; }

  IndexReader& reader_;
  const SearchOptions& options_;
  std::vector<ScoringTerm>& terms_;
  CollectionStats stats_;
  // BM25 bounds per term, precomputed: the query loop asks for millions.
  struct FastBound {
    double fw, one_minus_b, b_over_avg, k1, scale;
  };
  std::vector<FastBound> fast_;  // empty for TF-IDF
  DocNorms no_norms_;                   // stands in when the norms could not be read (status_ says why)
  const DocNorms* norms_ = &no_norms_;
  std::unordered_map<TermId, std::uint64_t> df_cache_;
  Status status_;                       // from the constructor (group_fields); score() returns it
  std::vector<double> group_x_;         // joint BM25 scratch: x per group
  std::vector<double> group_scale_;     // per group: joint BM25 max qtf * idf * (k1 + 1); joint TF-IDF max q
  std::vector<double> group_extra_;     // joint BM25: per group, its members' proximity bounds
  std::vector<double> term_norm_;       // joint BM25 scratch: tf / B per term
  JointVectors joint_;                  // joint TF-IDF: document vectors
  Proximity proximity_;                 // BM25TP parts (off unless asked for)
};

}  // namespace lode::rank
