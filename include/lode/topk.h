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
//    non-essential term at a time, and it is dropped as soon as it cannot pass θ;
//  * a long list may come with an impact tier (two-tier postings, Manning,
//    Raghavan & Schütze, "Introduction to Information Retrieval" §7.2.1):
//    its top postings are read as one more list, and the whole list stands
//    for the rest, bounded by the rest's points. Once θ passes what the rest
//    can give, only the top postings propose candidates; the whole list is
//    still used to look a candidate's tf up. A frequent word whose every
//    block holds some strong document thus stops costing its whole list.
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
  // Terms whose contributions saturate together (BM25F: one word in several
  // fields): term i's group, in 0 .. terms-1. When some group has two or
  // more terms, the walk bounds every group g's total on a document by
  // group_bound(g, s), s = the sum over its members found there of
  // member_raw(i, tf, length), with that member's tf and field length (or
  // doc_raw with the document's own length); group_bound rises with s and is
  // 0 at 0, member_raw is finite, rises with tf and falls with length. By default every
  // term is its own group and the raw amount is the bound itself.
  virtual std::size_t group(std::size_t i) const { return i; }
  virtual double member_raw(std::size_t i, std::uint32_t tf, std::uint32_t length) const {
    return block_bound(i, tf, length);
  }
  virtual double doc_raw(std::size_t i, std::uint32_t tf, DocId doc) const { return doc_bound(i, tf, doc); }
  virtual double group_bound(std::size_t /*g*/, double raw) const { return raw; }
  // The first document >= `doc` that may pass admit() (required clauses,
  // filters), or kNoDoc when none can. Called with increasing `doc`.
  virtual Result<DocId> next_admissible(DocId doc) { return doc; }
  // Forgets the documents asked before: the walk goes back to the first
  // document (its second pass, after the impact tiers' first). Errors end
  // the walk. By default there is nothing to forget.
  virtual Status restart() { return Status(); }
  // Whether `doc` may be returned at all (live, filters, required clauses).
  virtual Result<bool> admit(DocId doc) = 0;
  // The exact score of an admitted doc; tfs[i] = term i's tf in it (0 = absent).
  virtual Result<double> score(DocId doc, const std::vector<std::uint32_t>& tfs) = 0;
};

// A term's impact tier (lode/postings.h ImpactTier) as the walk reads it: a
// cursor over its top postings (null: none) and points covering the rest of
// its list. The term's own cursor still serves the rest and lookups.
struct TierCursor {
  PostingCursor* top = nullptr;
  std::span<const BoundPoint> rest;
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
  Walk(std::span<PostingCursor* const> cursors, std::span<const TierCursor> tiers, Model& model, std::size_t k,
       bool prune)
      : model_(model), k_(k), prune_(prune), tfs_(cursors.size(), 0), resolved_(cursors.size(), 0),
        tb_(cursors.size(), 0) {
    for (std::size_t i = 0; i < cursors.size(); ++i) {
      if (!cursors[i] || !cursors[i]->valid()) continue;
      PostingCursor* top = i < tiers.size() && tiers[i].top && tiers[i].top->valid() ? tiers[i].top : nullptr;
      // The rest before the top part: equal keys keep that order, so the top
      // part is always looked at (descending) before the rest.
      parts_.push_back(Part{cursors[i], i, false, top ? tiers[i].rest : std::span<const BoundPoint>{}, kNone});
      if (top) {
        parts_.back().rest = true;
        parts_.back().partner = parts_.size();
        parts_.push_back(Part{top, i, false, {}, parts_.size() - 1});
      }
    }
    for (const Part& p : parts_) all_.push_back(p.cursor);
  }

  Result<TopKResult> run() {
    make_groups();
    bound_.assign(parts_.size(), 0);
    for (std::size_t p = 0; p < parts_.size(); ++p) {
      const Part& part = parts_[p];
      bound_[p] = points_bound(part.term, part.cursor->list().list_points());
      if (part.rest) bound_[p] = std::min(bound_[p], points_bound(part.term, part.rest_points));
      if (!grouped_) bound_[p] = std::min(bound_[p], model_.term_bound(part.term));
    }
    // A tier is only worth its cursor when the rest bounds lower than it.
    for (std::size_t p = 0; p < parts_.size(); ++p)
      if (parts_[p].rest && bound_[p] >= bound_[parts_[p].partner]) unsplit(p);
    key_.assign(parts_.size(), 0);
    for (std::size_t p = 0; p < parts_.size(); ++p)
      key_[p] = grouped_ ? model_.group_bound(group_[parts_[p].term], bound_[p]) : bound_[p];
    cached_block_.assign(parts_.size(), kNone);
    block_bound_.assign(parts_.size(), 0);
    if (prune_ && tops_may_decide()) {
      // First the documents of the top parts alone, the rest only looked up
      // (on fresh cursors: the walk below starts over): their best k give a
      // θ near the final one. If no document outside them can reach it, that
      // is the answer; else the whole walk follows, starting from that θ.
      std::vector<std::unique_ptr<PostingCursor>> fresh;
      std::vector<PostingCursor*> given;
      for (Part& p : parts_) {
        given.push_back(p.cursor);
        fresh.push_back(std::make_unique<PostingCursor>(p.cursor->shared_list(), nullptr));
        p.cursor = fresh.back().get();
      }
      std::size_t lookups = 0;
      order_parts(/*tops_last=*/true, &lookups);
      lazy_ = lookups;
      Status first = walk();
      const double outside = lookups == 0 ? 0.0 : prefix_[lookups - 1];  // a document in no top part
      for (std::size_t p = 0; p < parts_.size(); ++p) {
        if (first.ok() && !parts_[p].cursor->status().ok()) first = parts_[p].cursor->status();
        parts_[p].cursor = given[p];
      }
      LODE_RETURN_IF_ERROR(first);
      LODE_RETURN_IF_ERROR(model_.restart());
      if (full_ && cannot_enter(outside)) {
        out_.matched_exact = false;
        return finish();
      }
      for (const ScoredDoc& d : heap_.container()) seeded_.push_back(d.doc);
      for (const ScoredDoc& d : tied_) seeded_.push_back(d.doc);
      std::sort(seeded_.begin(), seeded_.end());
      first_matched_ = out_.matched;
      out_.matched = 0;
      std::fill(cached_block_.begin(), cached_block_.end(), kNone);
      run_lazy_ = kNone;
    }
    order_parts(/*tops_last=*/false, nullptr);
    lazy_ = 0;
    while (full_ && lazy_ < order_.size() && cannot_enter(prefix_[lazy_])) ++lazy_;
    LODE_RETURN_IF_ERROR(walk());
    if (first_matched_ > 0) out_.matched_exact = false;
    out_.matched = std::max(out_.matched + seeded_.size(), first_matched_);  // seeded: scored once, not again
    return finish();
  }

 private:
  static constexpr std::size_t kNone = std::numeric_limits<std::size_t>::max();

  // Whether a first pass over the top parts may find k documents that no
  // document outside them can beat: only if a document in every top part
  // could score more than one in none (else, e.g. a rare word without a
  // tier beside frequent ones, the first pass is wasted work).
  bool tops_may_decide() {
    acc_clear();
    for (std::size_t p = 0; p < parts_.size(); ++p)
      if (is_top(parts_[p])) raise(parts_[p].term, bound_[p]);
    const double in_tops = value();
    if (in_tops == 0) return false;
    acc_clear();
    for (std::size_t p = 0; p < parts_.size(); ++p)
      if (!parts_[p].dropped && !is_top(parts_[p])) raise(parts_[p].term, bound_[p]);
    return in_tops > value();
  }

  // A heap whose container can be read (the documents of a first pass).
  struct Heap : std::priority_queue<ScoredDoc, std::vector<ScoredDoc>, Better> {
    const std::vector<ScoredDoc>& container() const { return c; }
  };

  // order_: the parts in use by ascending key; with tops_last, every part
  // that is not a top part first (their count in *lookups), then the top
  // parts. prefix_[m]: a document found only in order_[0..m]; a split term
  // counts the larger of its two parts (a document is in at most one).
  void order_parts(bool tops_last, std::size_t* lookups) {
    order_.clear();
    for (std::size_t p = 0; p < parts_.size(); ++p)
      if (!parts_[p].dropped) order_.push_back(p);
    auto top = [&](std::size_t p) { return is_top(parts_[p]); };
    std::stable_sort(order_.begin(), order_.end(), [&](std::size_t a, std::size_t b) {
      if (tops_last && top(a) != top(b)) return top(b);
      return key_[a] < key_[b];
    });
    if (lookups)
      *lookups = static_cast<std::size_t>(std::count_if(order_.begin(), order_.end(), [&](std::size_t p) { return !top(p); }));
    prefix_.clear();
    acc_clear();
    for (std::size_t p : order_) {
      raise(parts_[p].term, bound_[p]);
      prefix_.push_back(value());
    }
  }

  // Document at a time over the essential parts order_[lazy_..].
  Status walk() {
    while (true) {
      DocId doc = kNoDoc;
      for (std::size_t m = lazy_; m < order_.size(); ++m) {
        const PostingCursor& c = cursor(m);
        if (c.valid() && c.doc() < doc) doc = c.doc();
      }
      if (doc == kNoDoc) break;
      if (full_ && skip_blocks(doc)) {
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
    return Status();
  }

  Result<TopKResult> finish() {
    for (PostingCursor* c : all_)
      if (!c->status().ok()) return c->status();
    while (!heap_.empty()) {
      out_.ranked.push_back(std::move(const_cast<ScoredDoc&>(heap_.top())));
      heap_.pop();
    }
    std::reverse(out_.ranked.begin(), out_.ranked.end());
    std::sort(tied_.begin(), tied_.end(), ranks_above);
    for (ScoredDoc& d : tied_) out_.ranked.push_back(std::move(d));
    return std::move(out_);
  }


  // One cursor the walk reads: a term's whole list, or for a term with an
  // impact tier its top postings and its whole list standing for the rest
  // (bounded by the rest's points; a document of the top part found through
  // it gets its real tf, which is the same).
  struct Part {
    PostingCursor* cursor;
    std::size_t term;
    bool rest;                               // the whole list, for documents not in the top part
    std::span<const BoundPoint> rest_points;  // cover the rest
    std::size_t partner;                     // the other part of a split term, else kNone
    bool dropped = false;                    // a top part not worth reading (unsplit)
  };
  // A split term's top part (still read).
  static bool is_top(const Part& p) { return p.partner != kNone && !p.rest && !p.dropped; }

  PostingCursor& cursor(std::size_t m) { return *parts_[order_[m]].cursor; }
  // A document whose score is at most `bound` cannot enter the top k.
  bool cannot_enter(double bound) const { return full_ && bound + std::abs(bound) * kSlack < theta_; }
  // Reads rest part p's list as the term's whole list again.
  void unsplit(std::size_t p) {
    Part& rest = parts_[p];
    parts_[rest.partner].dropped = true;
    rest.rest = false;
    rest.partner = kNone;
    bound_[p] = points_bound(rest.term, rest.cursor->list().list_points());
    if (!grouped_) bound_[p] = std::min(bound_[p], model_.term_bound(rest.term));
  }
  // Groups of terms (TopKModel::group); grouped_ when one has two or more.
  // Then bounds are raw amounts (member_raw), turned into scores by group_bound.
  void make_groups() {
    group_.assign(tfs_.size(), 0);
    std::size_t groups = 0;
    for (std::size_t i = 0; i < tfs_.size(); ++i) {
      group_[i] = model_.group(i);
      groups = std::max(groups, group_[i] + 1);
    }
    gsum_.assign(groups, 0);
    std::vector<std::size_t> members(groups, 0);
    std::vector<bool> seen(tfs_.size(), false);
    for (const Part& p : parts_)
      if (!seen[p.term]) {
        seen[p.term] = true;
        if (++members[group_[p.term]] > 1) grouped_ = true;
      }
  }
  // The running bound, value(): the sum over groups of group_bound(gsum_)
  // (plain sum when not grouped_), tb_ = each term's share in it. Infinite
  // parts are counted apart, so taking one back leaves the finite sum intact.
  void acc_clear() {
    if (grouped_) std::fill(gsum_.begin(), gsum_.end(), 0.0);
    std::fill(tb_.begin(), tb_.end(), 0.0);
    total_ = 0;
    infinite_ = 0;
  }
  double value() const { return infinite_ > 0 ? std::numeric_limits<double>::infinity() : total_; }
  void acc_put(double x, int sign) {
    if (std::isinf(x)) infinite_ += sign;
    else total_ += sign * x;
  }
  void set(std::size_t term, double v) {
    if (!grouped_) {
      acc_put(tb_[term], -1);
      acc_put(v, +1);
      tb_[term] = v;
      return;
    }
    const std::size_t g = group_[term];  // raw amounts are finite
    acc_put(model_.group_bound(g, gsum_[g]), -1);
    gsum_[g] += v - tb_[term];
    tb_[term] = v;
    acc_put(model_.group_bound(g, gsum_[g]), +1);
  }
  void raise(std::size_t term, double v) {
    if (v > tb_[term]) set(term, v);
  }
  // Term i's largest bound (raw amount when grouped_) at the given points.
  double points_bound(std::size_t i, std::span<const BoundPoint> points) const {
    double b = 0;
    for (const BoundPoint& p : points)
      b = std::max(b, grouped_ ? model_.member_raw(i, p.tf, p.length) : model_.block_bound(i, p.tf, p.length));
    return b;
  }
  double doc_unit(std::size_t i, std::uint32_t tf, DocId doc) const {
    return grouped_ ? model_.doc_raw(i, tf, doc) : model_.doc_bound(i, tf, doc);
  }
  // The bound of essential part order_[m]'s current block, once per block.
  double current_block_bound(std::size_t m) {
    const std::size_t p = order_[m];
    const PostingCursor& c = *parts_[p].cursor;
    if (c.block() != cached_block_[p]) {
      cached_block_[p] = c.block();
      block_bound_[p] = std::min(bound_[p], points_bound(parts_[p].term, c.block_points()));
    }
    return block_bound_[p];
  }
  // Skips the run of documents up to the nearest end of an essential block
  // if no document in it can enter; returns whether it did.
  bool skip_blocks(DocId doc) {
    // Until the nearest block end, the essential blocks and so their bound
    // stay the same (cursors only move forward): only θ may have risen.
    if (doc <= run_end_ && lazy_ == run_lazy_) return cannot_enter(run_bound_) && skip_to(run_end_);
    DocId end = kNoDoc;
    acc_clear();
    for (std::size_t m = 0; m < lazy_; ++m) raise(parts_[order_[m]].term, bound_[order_[m]]);
    for (std::size_t m = lazy_; m < order_.size(); ++m) {
      const PostingCursor& c = cursor(m);
      if (!c.valid()) continue;
      end = std::min(end, c.block_last_doc());
      raise(parts_[order_[m]].term, current_block_bound(m));
    }
    if (end == kNoDoc) return false;
    run_end_ = end, run_lazy_ = lazy_, run_bound_ = value();
    return cannot_enter(run_bound_) && skip_to(end);
  }
  // Moves the essential cursors past `end`; returns true.
  bool skip_to(DocId end) {
    for (std::size_t m = lazy_; m < order_.size(); ++m) {
      PostingCursor& c = cursor(m);
      if (c.valid() && c.doc() <= end) c.seek(end + 1);
    }
    return true;
  }
  // Candidate `doc`: fills tfs_, tightening its bound one non-essential part
  // at a time (largest bound first); false once it cannot enter.
  bool gather(DocId doc) {
    std::fill(tfs_.begin(), tfs_.end(), 0);
    std::fill(resolved_.begin(), resolved_.end(), 0);
    acc_clear();
    for (std::size_t m = lazy_; m < order_.size(); ++m) {
      const PostingCursor& c = cursor(m);
      const std::size_t i = parts_[order_[m]].term;
      if (c.valid() && c.doc() == doc && !resolved_[i]) {
        tfs_[i] = c.tf();
        resolved_[i] = 1;
        set(i, doc_unit(i, tfs_[i], doc));
      }
    }
    for (std::size_t m = 0; m < lazy_; ++m)
      if (!resolved_[parts_[order_[m]].term]) raise(parts_[order_[m]].term, bound_[order_[m]]);
    for (std::size_t m = lazy_; m-- > 0;) {
      if (cannot_enter(value())) return false;
      const Part& part = parts_[order_[m]];
      const std::size_t i = part.term;
      if (resolved_[i]) continue;
      PostingCursor& c = *part.cursor;
      c.seek(doc);
      if (c.valid() && c.doc() == doc) {
        tfs_[i] = c.tf();
        resolved_[i] = 1;
        set(i, doc_unit(i, tfs_[i], doc));
      } else if (is_top(part)) {
        set(i, bound_[part.partner]);  // not in the top part: the rest (looked at next) bounds it
      } else {
        resolved_[i] = 1;
        set(i, 0.0);
      }
    }
    return !cannot_enter(value());
  }
  Status offer(DocId doc) {
    if (!seeded_.empty() && std::binary_search(seeded_.begin(), seeded_.end(), doc)) return Status();  // scored first
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
      if (lazy_ > 0) out_.matched_exact = false;  // documents only in those parts go unseen
    }
    return Status();
  }

  Model& model_;
  const std::size_t k_;
  const bool prune_;
  std::vector<Part> parts_;
  std::vector<PostingCursor*> all_;        // every part's cursor, for errors
  std::vector<std::uint32_t> tfs_;         // per term: tf in the candidate
  std::vector<char> resolved_;             // per term: the candidate's tf is known
  std::vector<double> tb_;                 // per term: its share of value()
  std::vector<std::size_t> group_;         // per term: its group
  std::vector<double> gsum_;               // per group: raw sum
  double total_ = 0;                       // the running bound's finite part (acc_clear, set)
  int infinite_ = 0;                       // and its infinite parts
  bool grouped_ = false;                   // some group has two or more terms
  std::vector<double> bound_;              // per part: bound on any document (raw when grouped_)
  std::vector<std::size_t> cached_block_;  // per part: the block whose bound is cached
  std::vector<double> block_bound_;        // per part: that bound
  std::vector<std::size_t> order_;  // parts in use, by ascending bound
  std::vector<double> prefix_;      // prefix_[m] = bound of a document found only in order_[0..m]
  std::size_t lazy_ = 0;            // order_[0..lazy_) are non-essential
  Heap heap_;
  std::vector<ScoredDoc> tied_;      // scored at the k-th score but not in heap_
  std::vector<DocId> seeded_;        // the first pass's heap and ties, by doc: not offered again
  std::uint64_t first_matched_ = 0;  // documents the first pass scored
  std::vector<double> key_;          // per part: its bound as a score, to order parts by
  bool full_ = false;               // heap holds k documents (pruning active)
  DocId run_end_ = 0;               // skip_blocks' last run of blocks: its end ...
  std::size_t run_lazy_ = kNone;    // ... lazy_ then ...
  double run_bound_ = 0;            // ... and the bound of any document in it
  double theta_ = 0;                // the k-th best score once full_
  TopKResult out_;
};

}  // namespace topk_detail

// `cursors[i]` may be null (a term absent from the index: never matches).
// count_all = true turns pruning off, so that `matched` counts every admitted
// document in the union of the postings; k = 0 returns no document and counts
// exactly too. Errors: the cursors' and the model's. `Model` is TopKModel or
// a class with the same methods (a `final` subclass gets direct calls).
// `tiers`, empty or one per term, gives terms an impact tier to read first.
template <class Model>
Result<TopKResult> top_k_walk(std::span<PostingCursor* const> cursors, Model& model, std::size_t k, bool count_all,
                              std::span<const TierCursor> tiers = {}) {
  return topk_detail::Walk<Model>(cursors, tiers, model, k, !count_all && k > 0).run();
}

// The same through TopKModel's virtual calls, over owned cursors.
Result<TopKResult> top_k(std::vector<std::unique_ptr<PostingCursor>>& cursors, TopKModel& model, std::size_t k,
                         bool count_all);

}  // namespace lode
