// lode/topk.h — the k best documents of a sum of per-term scores, without
// scoring every document that matches (safe dynamic pruning).
//
// Method: block-max MaxScore (Turtle & Flood 1995, "Query evaluation:
// strategies and optimizations"; block-max bounds after Ding & Suel 2011,
// "Faster top-k document retrieval using block-max indexes"; the variant
// compared in Mallia et al., ECIR 2019), document at a time:
//  * terms are ordered by the bound of their contribution to any document
//    (from their lists' bound points, lode/postings.h); once the k-th best
//    score θ exceeds the sum of the smallest bounds, those terms are
//    "non-essential": a document found only in them cannot enter, so only
//    the other terms' postings propose candidates;
//  * a run of documents where every essential term's current block bound
//    (the largest score at the block's bound points, computed once per block)
//    plus the non-essential bounds cannot pass θ is skipped without looking
//    at its documents;
//  * a candidate must pass the model's gate (required clauses and filters
//    jump the walk forward through their own cursors instead of being
//    tested on every document);
//  * a candidate's bound is tightened with its real tf and length, one
//    non-essential term at a time, and it is dropped as soon as it cannot pass θ.
// The result is exactly the exhaustive top k (same scores, same order, ties
// broken by lower doc id) followed by every other document whose score equals
// the k-th (so a caller can order ties by a key of its own, such as the id
// users see, and then cut at k): bounds are never below the true
// contributions, a bound only prunes a document that cannot reach the k-th
// score (ties are scored), and it is only trusted with a relative slack of
// 1e-9 so that rounding in a sum cannot drop a document that would have entered.
//
// The walk is a template over the model so that the per-candidate calls of a
// `final` model class are direct (inlined) calls; TopKModel is the interface
// it expects, and top_k() below runs it through virtual calls for callers
// that do not need the speed.
//
// Thread safety: a call uses the given cursors and model only; the model's
// methods are called from the calling thread.
#pragma once

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <memory>
#include <queue>
#include <span>
#include <vector>

#include "lode/index.h"
#include "lode/status.h"

namespace lode {

inline constexpr DocId kNoDoc = std::numeric_limits<DocId>::max();

// What the walk needs to know about a query's terms; term i is cursors[i].
// Every bound must be >= the term's true contribution (all contributions >= 0).
class TopKModel {
 public:
  virtual ~TopKModel() = default;
  // Bound of term i's contribution to any document (infinity if unknown);
  // the walk also bounds it with the list's bound points.
  virtual double term_bound(std::size_t i) const = 0;
  // Bound for any document with tf <= `tf` and field length >= `length`:
  // must rise (weakly) with tf and fall with length.
  virtual double block_bound(std::size_t i, std::uint32_t tf, std::uint32_t length) const = 0;
  // Bound for `doc`, where term i has frequency tf (> 0).
  virtual double doc_bound(std::size_t i, std::uint32_t tf, DocId doc) const = 0;
  // Terms whose contributions are bounded together (BM25F: one word in two
  // fields saturates once): term i's group, in 0 .. terms-1, and a cap on any
  // document's total from group g given each member's bound points (lists
  // indexed like the members, ascending term index). By default every term
  // is its own group and nothing is capped.
  virtual std::size_t group(std::size_t i) const { return i; }
  virtual double group_cap(std::size_t /*g*/, std::span<const std::size_t> /*members*/,
                           std::span<const std::span<const BoundPoint>> /*points*/) const {
    return std::numeric_limits<double>::infinity();
  }
  // The first document >= `doc` that may pass admit() (required clauses,
  // filters), or kNoDoc when none can. Called with increasing `doc`.
  virtual Result<DocId> next_admissible(DocId doc) { return doc; }
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
  // Best first, ties by lower doc id: the top k, then the documents tied with
  // the k-th score that did not fit (so possibly more than k entries).
  std::vector<ScoredDoc> ranked;
  std::uint64_t matched = 0;      // admitted documents scored
  bool matched_exact = true;      // false: pruning skipped documents, so matched is a lower bound
};

namespace topk_detail {

// Relative slack before a bound is trusted to prune: covers the rounding of
// sums of up to millions of terms (n * 2^-53 relative), with room to spare.
inline constexpr double kSlack = 1e-9;

struct Better {
  bool operator()(const ScoredDoc& a, const ScoredDoc& b) const { return ranks_above(a, b); }
};

template <class Model>
class Walk {
 public:
  Walk(std::span<PostingCursor* const> cursors, Model& model, std::size_t k, bool prune)
      : cursors_(cursors.begin(), cursors.end()), model_(model), k_(k), prune_(prune), tfs_(cursors.size(), 0),
        cached_block_(cursors.size(), kNone), block_bound_(cursors.size(), 0) {}

  Result<TopKResult> run() {
    term_bound_.assign(cursors_.size(), 0);
    for (std::size_t i = 0; i < cursors_.size(); ++i)
      if (cursors_[i] && cursors_[i]->valid()) {
        order_.push_back(i);
        term_bound_[i] = std::min(model_.term_bound(i), points_bound(i, cursors_[i]->list().list_points()));
      }
    make_groups();
    std::stable_sort(order_.begin(), order_.end(),
                     [&](std::size_t a, std::size_t b) { return term_bound_[a] < term_bound_[b]; });
    // prefix_[m]: a document found only in order_[0..m], groups capped.
    clear_groups();
    for (std::size_t i : order_) {
      gsum_[group_[i]] += term_bound_[i];
      prefix_.push_back(capped());
    }

    while (true) {
      DocId doc = kNoDoc;
      for (std::size_t m = lazy_; m < order_.size(); ++m) {
        const PostingCursor& c = cursor(m);
        if (c.valid() && c.doc() < doc) doc = c.doc();
      }
      if (doc == kNoDoc) break;
      if (full_ && skip_blocks()) {
        out_.matched_exact = false;
        continue;
      }
      auto gate = model_.next_admissible(doc);
      if (!gate) return gate.status();
      if (*gate != doc) {  // nothing admissible before *gate: jump there
        if (*gate == kNoDoc) break;
        for (std::size_t m = lazy_; m < order_.size(); ++m) cursor(m).seek(*gate);
        continue;
      }
      if (gather(doc)) {
        LODE_RETURN_IF_ERROR(offer(doc));
      } else {
        out_.matched_exact = false;
      }
      for (std::size_t m = lazy_; m < order_.size(); ++m) {
        PostingCursor& c = cursor(m);
        if (c.valid() && c.doc() == doc) c.next();
      }
    }
    for (PostingCursor* c : cursors_)
      if (c && !c->status().ok()) return c->status();
    while (!heap_.empty()) {
      out_.ranked.push_back(std::move(const_cast<ScoredDoc&>(heap_.top())));
      heap_.pop();
    }
    std::reverse(out_.ranked.begin(), out_.ranked.end());
    std::sort(tied_.begin(), tied_.end(), ranks_above);
    for (ScoredDoc& d : tied_) out_.ranked.push_back(std::move(d));
    return std::move(out_);
  }

 private:
  static constexpr std::size_t kNone = std::numeric_limits<std::size_t>::max();

  PostingCursor& cursor(std::size_t m) { return *cursors_[order_[m]]; }
  // A document whose score is at most `bound` cannot enter the top k.
  bool cannot_enter(double bound) const { return full_ && bound + std::abs(bound) * kSlack < theta_; }
  // Bound of a document found only in the first m terms of order_.
  double lazy_bound(std::size_t m) const { return m == 0 ? 0.0 : prefix_[m - 1]; }
  // Groups of terms (TopKModel::group) and their caps.
  void make_groups() {
    group_.assign(cursors_.size(), 0);
    std::size_t groups = 0;
    for (std::size_t i = 0; i < cursors_.size(); ++i) {
      group_[i] = model_.group(i);
      groups = std::max(groups, group_[i] + 1);
    }
    cap_.assign(groups, std::numeric_limits<double>::infinity());
    gsum_.assign(groups, 0);
    for (std::size_t g = 0; g < groups; ++g) {
      std::vector<std::size_t> members;
      std::vector<std::span<const BoundPoint>> points;
      for (std::size_t i : order_)
        if (group_[i] == g) members.push_back(i);
      std::sort(members.begin(), members.end());
      for (std::size_t i : members) points.push_back(cursors_[i]->list().list_points());
      if (members.size() > 1) cap_[g] = model_.group_cap(g, members, points);
      if (members.size() > 1) grouped_ = true;
    }
  }
  void clear_groups() { std::fill(gsum_.begin(), gsum_.end(), 0.0); }
  // The sum of gsum_ with each group capped.
  double capped() const {
    double total = 0;
    for (std::size_t g = 0; g < gsum_.size(); ++g) total += std::min(gsum_[g], cap_[g]);
    return total;
  }
  double points_bound(std::size_t i, std::span<const BoundPoint> points) const {
    double b = 0;
    for (const BoundPoint& p : points) b = std::max(b, model_.block_bound(i, p.tf, p.length));
    return b;
  }
  // The bound of essential term order_[m]'s current block, once per block.
  double current_block_bound(std::size_t m) {
    const std::size_t i = order_[m];
    const PostingCursor& c = *cursors_[i];
    if (c.block() != cached_block_[i]) {
      cached_block_[i] = c.block();
      block_bound_[i] = points_bound(i, c.block_points());
    }
    return block_bound_[i];
  }
  // Skips the run of documents up to the nearest end of an essential block
  // if no document in it can enter; returns whether it did.
  bool skip_blocks() {
    DocId end = kNoDoc;
    double bound = 0;
    if (grouped_) {
      clear_groups();
      for (std::size_t m = 0; m < lazy_; ++m) gsum_[group_[order_[m]]] += term_bound_[order_[m]];
    } else {
      bound = lazy_bound(lazy_);
    }
    for (std::size_t m = lazy_; m < order_.size(); ++m) {
      const PostingCursor& c = cursor(m);
      if (!c.valid()) continue;
      end = std::min(end, c.block_last_doc());
      if (grouped_) gsum_[group_[order_[m]]] += current_block_bound(m);
      else bound += current_block_bound(m);
    }
    if (grouped_) bound = capped();
    if (end == kNoDoc || !cannot_enter(bound)) return false;
    for (std::size_t m = lazy_; m < order_.size(); ++m) {
      PostingCursor& c = cursor(m);
      if (c.valid() && c.doc() <= end) c.seek(end + 1);
    }
    return true;
  }
  // Candidate `doc`: fills tfs_, tightening its bound; false if dropped.
  bool gather(DocId doc) {
    std::fill(tfs_.begin(), tfs_.end(), 0);
    if (grouped_) return gather_grouped(doc);
    double known = 0;  // bound from the terms whose tf in doc is known
    for (std::size_t m = lazy_; m < order_.size(); ++m) {
      const PostingCursor& c = cursor(m);
      if (c.valid() && c.doc() == doc) {
        const std::size_t i = order_[m];
        tfs_[i] = c.tf();
        known += model_.doc_bound(i, tfs_[i], doc);
      }
    }
    // Non-essential terms, largest bound first, while the doc can still enter.
    for (std::size_t m = lazy_; m-- > 0;) {
      if (cannot_enter(known + lazy_bound(m + 1))) return false;
      PostingCursor& c = cursor(m);
      c.seek(doc);
      if (c.valid() && c.doc() == doc) {
        tfs_[order_[m]] = c.tf();
        known += model_.doc_bound(order_[m], c.tf(), doc);
      }
    }
    return !cannot_enter(known);
  }
  // gather() with group caps: per group, the known terms' doc bounds plus
  // the term bounds of the non-essential terms not looked at yet.
  bool gather_grouped(DocId doc) {
    clear_groups();
    for (std::size_t m = 0; m < lazy_; ++m) gsum_[group_[order_[m]]] += term_bound_[order_[m]];
    for (std::size_t m = lazy_; m < order_.size(); ++m) {
      const PostingCursor& c = cursor(m);
      if (c.valid() && c.doc() == doc) {
        const std::size_t i = order_[m];
        tfs_[i] = c.tf();
        gsum_[group_[i]] += model_.doc_bound(i, tfs_[i], doc);
      }
    }
    for (std::size_t m = lazy_; m-- > 0;) {
      if (cannot_enter(capped())) return false;
      const std::size_t i = order_[m];
      PostingCursor& c = cursor(m);
      c.seek(doc);
      gsum_[group_[i]] -= term_bound_[i];
      if (c.valid() && c.doc() == doc) {
        tfs_[i] = c.tf();
        gsum_[group_[i]] += model_.doc_bound(i, c.tf(), doc);
      }
    }
    return !cannot_enter(capped());
  }
  Status offer(DocId doc) {
    auto admitted = model_.admit(doc);
    if (!admitted) return admitted.status();
    if (!*admitted) return Status();
    auto score = model_.score(doc, tfs_);
    if (!score) return score.status();
    ++out_.matched;
    if (k_ == 0) return Status();
    if (heap_.size() == k_) {
      const ScoredDoc& worst = heap_.top();
      if (*score < worst.score) return Status();
      if (*score == worst.score && !(doc < worst.doc)) {
        tied_.push_back(ScoredDoc{*score, doc, tfs_});
        return Status();
      }
      ScoredDoc out = std::move(const_cast<ScoredDoc&>(heap_.top()));
      heap_.pop();
      heap_.push(ScoredDoc{*score, doc, tfs_});
      // tied_ holds the documents left out at the k-th score: still tied if
      // that score stays, out of reach once it rises.
      if (heap_.top().score == out.score) tied_.push_back(std::move(out));
      else tied_.clear();
    } else {
      heap_.push(ScoredDoc{*score, doc, tfs_});
    }
    if (prune_ && heap_.size() == k_) {
      full_ = true;
      theta_ = heap_.top().score;
      while (lazy_ < order_.size() && cannot_enter(prefix_[lazy_])) ++lazy_;
      if (lazy_ > 0) out_.matched_exact = false;  // documents only in those terms go unseen
    }
    return Status();
  }

  std::vector<PostingCursor*> cursors_;
  Model& model_;
  const std::size_t k_;
  const bool prune_;
  std::vector<std::uint32_t> tfs_;
  std::vector<std::size_t> cached_block_;  // per term: the block whose bound is cached
  std::vector<double> block_bound_;        // per term: that bound
  std::vector<double> term_bound_;         // per term: bound on any document
  std::vector<std::size_t> group_;         // per term: its group
  std::vector<double> cap_;                // per group: cap on its total
  std::vector<double> gsum_;               // per group: scratch sums
  bool grouped_ = false;                   // some group has two or more terms
  std::vector<std::size_t> order_;  // terms with postings, by ascending term bound
  std::vector<double> prefix_;      // prefix_[m] = sum of the bounds of order_[0..m]
  std::size_t lazy_ = 0;            // order_[0..lazy_) are non-essential
  std::priority_queue<ScoredDoc, std::vector<ScoredDoc>, Better> heap_;
  std::vector<ScoredDoc> tied_;     // scored at the k-th score but not in heap_
  bool full_ = false;               // heap holds k documents (pruning active)
  double theta_ = 0;                // the k-th best score once full_
  TopKResult out_;
};

}  // namespace topk_detail

// `cursors[i]` may be null (a term absent from the index: never matches).
// count_all = true turns pruning off, so that `matched` counts every admitted
// document in the union of the postings; k = 0 returns no document and counts
// exactly too. Errors: the cursors' and the model's. `Model` is TopKModel or
// a class with the same methods (a `final` subclass gets direct calls).
template <class Model>
Result<TopKResult> top_k_walk(std::span<PostingCursor* const> cursors, Model& model, std::size_t k, bool count_all) {
  return topk_detail::Walk<Model>(cursors, model, k, !count_all && k > 0).run();
}

// The same through TopKModel's virtual calls, over owned cursors.
Result<TopKResult> top_k(std::vector<std::unique_ptr<PostingCursor>>& cursors, TopKModel& model, std::size_t k,
                         bool count_all);

}  // namespace lode
