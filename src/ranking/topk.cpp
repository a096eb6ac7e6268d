// Pruned top-k: MaxScore with block-max skipping (method in lode/topk.h).
#include "lode/topk.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <queue>

namespace lode {
namespace {

// ranks_above as a priority_queue comparator: the worst kept document is
// on top, ready to be replaced.
struct Better {
  bool operator()(const ScoredDoc& a, const ScoredDoc& b) const { return ranks_above(a, b); }
};

// Relative slack before a bound is trusted to prune: covers the rounding of
// sums of up to millions of terms (n * 2^-53 relative), with room to spare.
constexpr double kSlack = 1e-9;

class Walk {
 public:
  Walk(std::vector<std::unique_ptr<PostingCursor>>& cursors, TopKModel& model, std::size_t k, bool prune)
      : cursors_(cursors), model_(model), k_(k), prune_(prune), tfs_(cursors.size(), 0),
        block_last_(cursors.size(), kNoBlock), block_bound_(cursors.size(), 0) {}

  Result<TopKResult> run();

 private:
  PostingCursor& cursor(std::size_t m) { return *cursors_[order_[m]]; }
  // A document whose score is at most `bound` cannot enter the top k.
  bool cannot_enter(double bound) const { return full_ && bound + std::abs(bound) * kSlack < theta_; }
  // Bound of a document found only in the first m terms of order_.
  double lazy_bound(std::size_t m) const { return m == 0 ? 0.0 : prefix_[m - 1]; }
  // The block bound of essential term order_[m]'s current block (cached).
  double current_block_bound(std::size_t m);
  // Skips the run of documents up to the nearest end of an essential block
  // if no document in it can enter; returns whether it did.
  bool skip_blocks();
  // Candidate `doc`: fills tfs_, tightening its bound; false if dropped.
  bool gather(DocId doc);
  Status offer(DocId doc);

  std::vector<std::unique_ptr<PostingCursor>>& cursors_;
  TopKModel& model_;
  const std::size_t k_;
  const bool prune_;
  std::vector<std::uint32_t> tfs_;
  static constexpr DocId kNoBlock = std::numeric_limits<DocId>::max();
  std::vector<DocId> block_last_;    // per term: last doc of the block whose bound is cached
  std::vector<double> block_bound_;  // per term: that bound
  std::vector<std::size_t> order_;  // terms with postings, by ascending term bound
  std::vector<double> prefix_;      // prefix_[m] = sum of the bounds of order_[0..m]
  std::size_t lazy_ = 0;            // order_[0..lazy_) are non-essential
  std::priority_queue<ScoredDoc, std::vector<ScoredDoc>, Better> heap_;
  bool full_ = false;               // heap holds k documents (pruning active)
  double theta_ = 0;                // the k-th best score once full_
  TopKResult out_;
};

double Walk::current_block_bound(std::size_t m) {
  PostingCursor& c = cursor(m);
  const std::size_t i = order_[m];
  if (c.block_last_doc() != block_last_[i]) {  // a new block: its bound once
    block_last_[i] = c.block_last_doc();
    block_bound_[i] = model_.block_bound(i, c.block_max_tf(), c.block_min_length());
  }
  return block_bound_[i];
}

bool Walk::skip_blocks() {
  DocId end = 0;
  bool any = false;
  double bound = lazy_bound(lazy_);
  for (std::size_t m = lazy_; m < order_.size(); ++m) {
    PostingCursor& c = cursor(m);
    if (!c.valid()) continue;
    end = any ? std::min(end, c.block_last_doc()) : c.block_last_doc();
    any = true;
    bound += current_block_bound(m);
  }
  if (!any || !cannot_enter(bound)) return false;
  for (std::size_t m = lazy_; m < order_.size(); ++m) {
    PostingCursor& c = cursor(m);
    if (c.valid() && c.doc() <= end) c.seek(end + 1);
  }
  return true;
}

bool Walk::gather(DocId doc) {
  std::fill(tfs_.begin(), tfs_.end(), 0);
  // First with the blocks' min lengths (no per-document lookup), then exact.
  double known = 0;  // bound from the terms whose tf in doc is known
  for (std::size_t m = lazy_; m < order_.size(); ++m) {
    PostingCursor& c = cursor(m);
    if (c.valid() && c.doc() == doc) {
      tfs_[order_[m]] = c.tf();
      known += model_.block_bound(order_[m], c.tf(), c.block_min_length());
    }
  }
  if (cannot_enter(known + lazy_bound(lazy_))) return false;
  known = 0;
  for (std::size_t m = lazy_; m < order_.size(); ++m)
    if (tfs_[order_[m]] > 0) known += model_.doc_bound(order_[m], tfs_[order_[m]], doc);
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

Status Walk::offer(DocId doc) {
  auto admitted = model_.admit(doc);
  if (!admitted) return admitted.status();
  if (!*admitted) return Status();
  auto score = model_.score(doc, tfs_);
  if (!score) return score.status();
  ++out_.matched;
  if (k_ == 0) return Status();
  ScoredDoc candidate{*score, doc, {}};
  if (heap_.size() == k_) {
    if (!Better()(candidate, heap_.top())) return Status();
    heap_.pop();
  }
  candidate.tfs = tfs_;
  heap_.push(std::move(candidate));
  if (prune_ && heap_.size() == k_) {
    full_ = true;
    theta_ = heap_.top().score;
    while (lazy_ < order_.size() && cannot_enter(prefix_[lazy_])) ++lazy_;
    if (lazy_ > 0) out_.matched_exact = false;  // documents only in those terms go unseen
  }
  return Status();
}

Result<TopKResult> Walk::run() {
  std::vector<double> bound(cursors_.size(), 0);
  for (std::size_t i = 0; i < cursors_.size(); ++i)
    if (cursors_[i] && cursors_[i]->valid()) {
      order_.push_back(i);
      bound[i] = model_.term_bound(i);
    }
  std::stable_sort(order_.begin(), order_.end(), [&](std::size_t a, std::size_t b) { return bound[a] < bound[b]; });
  double sum = 0;
  for (std::size_t i : order_) prefix_.push_back(sum += bound[i]);

  while (true) {
    DocId doc = 0;
    bool any = false;
    for (std::size_t m = lazy_; m < order_.size(); ++m) {
      PostingCursor& c = cursor(m);
      if (c.valid() && (!any || c.doc() < doc)) {
        doc = c.doc();
        any = true;
      }
    }
    if (!any) break;
    if (full_ && skip_blocks()) {
      out_.matched_exact = false;
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
  for (auto& c : cursors_)
    if (c && !c->status().ok()) return c->status();
  while (!heap_.empty()) {
    out_.ranked.push_back(std::move(const_cast<ScoredDoc&>(heap_.top())));
    heap_.pop();
  }
  std::reverse(out_.ranked.begin(), out_.ranked.end());
  return std::move(out_);
}

}  // namespace

Result<TopKResult> top_k(std::vector<std::unique_ptr<PostingCursor>>& cursors, TopKModel& model, std::size_t k,
                         bool count_all) {
  return Walk(cursors, model, k, !count_all && k > 0).run();
}

}  // namespace lode
