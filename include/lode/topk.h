// lode/topk.h — the k best documents of a sum of per-term scores, without
// scoring every document that matches (safe dynamic pruning).
//
// Method: MaxScore (Turtle & Flood 1995, "Query evaluation: strategies and
// optimizations") over block-max bounds (Ding & Suel 2011, "Faster top-k
// document retrieval using block-max indexes"), document at a time:
//  * terms are ordered by the bound of their contribution to any document;
//    once the k-th best score θ exceeds the sum of the smallest bounds, those
//    terms are "non-essential": a document found only in them cannot enter,
//    so only the other terms' postings propose candidates;
//  * a run of documents where every essential term's current block bound
//    (from the block's stored max tf and min field length) plus the
//    non-essential bounds cannot pass θ is skipped without decoding;
//  * a candidate's bound is tightened with its real tf (and length), one
//    non-essential term at a time, and it is dropped as soon as it cannot pass θ.
// The result is exactly the exhaustive top k (same scores, same order, ties
// broken by lower doc id): bounds are never below the true contributions,
// and a bound is only trusted to prune with a relative slack of 1e-9 so that
// rounding in a sum cannot drop a document that would have entered.
//
// Thread safety: a call uses the given cursors and model only; the model's
// methods are called from the calling thread.
#pragma once

#include <cstdint>
#include <memory>
#include <vector>

#include "lode/index.h"
#include "lode/status.h"

namespace lode {

// What the walk needs to know about a query's terms; term i is cursors[i].
// Every bound must be >= the term's true contribution (all contributions >= 0).
class TopKModel {
 public:
  virtual ~TopKModel() = default;
  // Bound of term i's contribution to any document (infinity if unknown).
  virtual double term_bound(std::size_t i) const = 0;
  // Bound for any document with tf <= max_tf and field length >= min_length.
  virtual double block_bound(std::size_t i, std::uint32_t max_tf, std::uint32_t min_length) const = 0;
  // Bound for `doc`, where term i has frequency tf (> 0).
  virtual double doc_bound(std::size_t i, std::uint32_t tf, DocId doc) const = 0;
  // Whether `doc` may be returned at all (live, filters, required clauses).
  virtual Result<bool> admit(DocId doc) = 0;
  // The exact score of an admitted doc; tfs[i] = term i's tf in it (0 = absent).
  virtual Result<double> score(DocId doc, const std::vector<std::uint32_t>& tfs) = 0;
};

struct ScoredDoc {
  double score = 0;
  DocId doc = 0;
  std::vector<std::uint32_t> tfs;  // per term, as passed to TopKModel::score
};

// The ranking order: a ranks above b with a higher score, or an equal score
// and a lower doc id (the document indexed first).
inline bool ranks_above(const ScoredDoc& a, const ScoredDoc& b) {
  return a.score != b.score ? a.score > b.score : a.doc < b.doc;
}

struct TopKResult {
  std::vector<ScoredDoc> ranked;  // best first; ties by lower doc id
  std::uint64_t matched = 0;      // admitted documents scored
  bool matched_exact = true;      // false: pruning skipped documents, so matched is a lower bound
};

// `cursors[i]` may be null (a term absent from the index: never matches).
// count_all = true turns pruning off, so that `matched` counts every admitted
// document in the union of the postings; k = 0 returns no document and counts
// exactly too. Errors: the cursors' and the model's.
Result<TopKResult> top_k(std::vector<std::unique_ptr<PostingCursor>>& cursors, TopKModel& model, std::size_t k,
                         bool count_all);

}  // namespace lode
