// Building stored postings segments (docs/index-format.md, format 4): the
// writer's side of lode/postings.h. Store-neutral: a segment is a few
// byte strings and numbers; the store decides where they go.
#pragma once

#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "lode/postings.h"

namespace lode::codec {

// A segment ready to store: one row of postings and one of positions.
struct BuiltSegment {
  DocId first_doc = 0, last_doc = 0;
  std::uint32_t count = 0;  // postings
  std::string head, data, positions;
};

// The Pareto frontier of `points` (no point has both tf >= and length <= of
// another), ascending by tf, merged down to `cap` points by replacing two
// neighbours (t1, l1), (t2, l2), t1 < t2, l1 < l2, with (t2, l1), which
// dominates both. Empty input gives an empty result.
std::vector<BoundPoint> bound_frontier(std::vector<BoundPoint> points, std::size_t cap = kMaxBoundPoints);

// Collects postings in increasing document order into blocks of kBlockSize
// and at most kSegmentBlocks blocks. Not thread-safe.
class SegmentBuilder {
 public:
  // Adds a posting: doc > every doc added before, tf >= 1, `length` the
  // field's length in doc (>= tf; 0: unknown, covered by add_points),
  // `positions` its encoded position varints.
  void add(DocId doc, std::uint32_t tf, std::uint32_t length, std::string_view positions);
  // Adds bound points for documents of the open block whose lengths are not
  // known (a partial block taken back for refilling).
  void add_points(std::span<const BoundPoint> points);
  // Appends block `b` of `list` unchanged, with its positions `pos`.
  // REQUIRES: no open block; its documents follow every doc added before.
  void add_block(const PostingList& list, std::size_t b, std::string_view pos);
  // Blocks finished or open.
  std::size_t blocks() const { return blocks_ + (pending_docs_.empty() ? 0 : 1); }
  bool full() const { return blocks_ == kSegmentBlocks; }
  bool empty() const { return blocks() == 0; }
  // Closes the open block and returns the segment; the builder starts anew.
  BuiltSegment finish();

 private:
  void close_block();
  void put_header(std::uint32_t n, DocId last, std::size_t bytes, std::size_t pos_bytes,
                  const std::vector<BoundPoint>& points);

  BuiltSegment out_;
  std::size_t blocks_ = 0;
  std::string body_;                   // block headers after the count
  DocId last_ = 0;                     // last doc of the segment so far (0: none)
  std::vector<DocId> pending_docs_;
  std::vector<std::uint32_t> pending_tfs_;
  std::vector<BoundPoint> pending_points_;
  std::size_t pending_pos_start_ = 0;  // where the open block's positions start in out_.positions
  std::vector<std::uint32_t> scratch_;
};

}  // namespace lode::codec
