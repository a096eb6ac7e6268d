// lode/postings.h — one term's postings as the query loop reads them.
//
// A term's postings are stored as segments (docs/index-format.md, format 4):
// each holds up to kSegmentBlocks blocks of up to kBlockSize documents, bit
// packed, and a header array giving every block's last document, its byte
// range and its bound points. A PostingList is the decoded header array of
// all of a term's segments plus their packed bytes: immutable once built, so
// one list may serve many cursors on many threads (a reader's cache shares
// it). A PostingCursor walks one list in document order, decoding one block
// at a time.
//
// Bound points make block-max pruning exact for any scoring parameters:
// every document of a block has tf <= p.tf and field length >= p.length for
// at least one of the block's points p. Any score that rises with tf and
// falls with length (every BM25 form, lnc cosine) is therefore at most the
// largest of its values at the points; the writer stores the block's Pareto
// frontier of (tf, length), so that maximum is the block's true maximum
// (unless more than kMaxBoundPoints points were merged, which only loosens it).
//
// Thread safety: a PostingList is immutable and may be shared; a cursor is
// used by one thread at a time.
#pragma once

#include <cstdint>
#include <memory>
#include <span>
#include <string>
#include <vector>

#include "lode/status.h"

namespace lode {

using DocId = std::uint32_t;

inline constexpr std::uint32_t kBlockSize = 128;      // documents per postings block
inline constexpr std::uint32_t kSegmentBlocks = 256;  // blocks per stored segment (one row)
inline constexpr std::uint32_t kMaxBoundPoints = 4;   // bound points per block
inline constexpr std::uint32_t kMaxListPoints = 16;   // bound points per list (computed, not stored)

// A (tf, length) corner dominating some documents of a block (see above).
struct BoundPoint {
  std::uint32_t tf = 0;
  std::uint32_t length = 0;
  bool operator==(const BoundPoint&) const = default;
};

// Loads what a list does not hold: the positions of one stored segment.
class PositionSource {
 public:
  virtual ~PositionSource() = default;
  // The positions blob of segment `key` (a store row), or Corruption/IOError.
  virtual Result<std::string> segment_positions(std::int64_t key) = 0;
};

class PostingList {
 public:
  struct Block {
    DocId before = 0;               // the document before its first (previous block's last)
    DocId last = 0;                 // its last document
    std::uint32_t segment = 0;      // index into segments()
    std::uint32_t offset = 0;       // byte offset of its packed data in the segment's data
    std::uint32_t bytes = 0;        // packed data bytes
    std::uint32_t pos_offset = 0;   // byte offset of its positions in the segment's positions
    std::uint32_t pos_bytes = 0;
    std::uint32_t points = 0;       // index of its first bound point in points()
    std::uint16_t n = 0;            // documents, 1..kBlockSize
    std::uint8_t point_count = 0;   // 1..kMaxBoundPoints
  };
  struct Segment {
    std::int64_t key = 0;  // the store's row id, for PositionSource
    std::string data;      // the packed blocks
  };
  // One stored segment as the store returns it (docs/index-format.md).
  struct StoredSegment {
    std::int64_t key = 0;
    DocId first_doc = 0, last_doc = 0;
    std::uint32_t count = 0;  // postings
    std::string head, data;
  };

  // Decodes the header arrays of `segments` (ascending by first doc, not
  // overlapping) and takes their data. Corruption naming `what` (e.g. "term
  // 12") when a header or range does not check out.
  static Result<std::shared_ptr<const PostingList>> build(std::vector<StoredSegment> segments, const std::string& what);

  std::span<const Block> blocks() const { return blocks_; }
  // Bound points covering every document of the list (a merge of its
  // blocks' points: a looser cover, at most kMaxListPoints corners).
  std::span<const BoundPoint> list_points() const { return list_points_; }
  std::span<const BoundPoint> points(const Block& b) const { return {points_.data() + b.points, b.point_count}; }
  const std::vector<Segment>& segments() const { return segments_; }
  std::uint64_t postings() const { return postings_; }
  // Bytes held (for caches).
  std::size_t memory() const;
  // Decodes block `b` into docs/tfs (each kBlockSize long). Corruption on bad data.
  Status decode(std::size_t b, DocId* docs, std::uint32_t* tfs) const;

 private:
  std::vector<Block> blocks_;
  std::vector<BoundPoint> points_;
  std::vector<BoundPoint> list_points_;
  std::vector<Segment> segments_;
  std::uint64_t postings_ = 0;
  std::string what_;
};

// The high-impact part of a long list, for the top-k walk (lode/topk.h):
// its postings of largest tf / length impact, as a list of their own (real
// tfs and lengths in its bound points, no positions), and points covering
// every other live posting of the list. The split only speeds the walk up:
// the rest's points bound the rest for any scoring parameters, so results
// do not depend on which postings were chosen. Immutable and shareable.
struct ImpactTier {
  std::shared_ptr<const PostingList> top;
  std::vector<BoundPoint> rest_points;
};

// Walks a PostingList in increasing document order. Dead documents are
// included; callers check liveness. An I/O or decoding error makes valid()
// false and status() non-ok.
class PostingCursor {
 public:
  // `positions` may be null (positions() then fails); it must outlive the cursor.
  PostingCursor(std::shared_ptr<const PostingList> list, PositionSource* positions);
  // A cursor that failed before it started: not valid(), status() = error.
  explicit PostingCursor(Status error) : positions_source_(nullptr), status_(std::move(error)) {}

  bool valid() const { return valid_; }
  DocId doc() const { return docs_[i_]; }          // REQUIRES: valid()
  std::uint32_t tf() const { return tfs_[i_]; }    // REQUIRES: valid()
  void next() {                                    // REQUIRES: valid()
    if (++i_ < n_) return;
    enter(block_ + 1, 0);
  }
  // Moves to the first posting with doc >= target (never backwards).
  void seek(DocId target) {
    if (!valid_ || docs_[i_] >= target) return;
    if (target <= list_->blocks()[block_].last) {
      while (docs_[i_] < target) ++i_;
      return;
    }
    enter(find_block(target), target);
  }
  // Positions of the term in the current document, ascending. REQUIRES: valid().
  Result<std::vector<std::uint32_t>> positions();

  // The current block (REQUIRES: valid()), its last document and bound points.
  std::size_t block() const { return block_; }
  DocId block_last_doc() const { return list_->blocks()[block_].last; }
  std::span<const BoundPoint> block_points() const { return list_->points(list_->blocks()[block_]); }
  const PostingList& list() const { return *list_; }
  const std::shared_ptr<const PostingList>& shared_list() const { return list_; }
  Status status() const { return status_; }

 private:
  std::size_t find_block(DocId target) const;   // first block from block_ with last >= target
  void enter(std::size_t b, DocId target);      // decodes block b, moves to its first doc >= target

  std::shared_ptr<const PostingList> list_;
  PositionSource* positions_source_;
  std::size_t block_ = 0;
  std::uint32_t i_ = 0, n_ = 0;
  bool valid_ = false;
  Status status_;
  alignas(64) DocId docs_[kBlockSize];
  std::uint32_t tfs_[kBlockSize];
  std::int64_t pos_segment_ = -1;  // segment whose positions pos_ holds
  std::string pos_;
  std::vector<std::uint32_t> pos_starts_;  // per doc of the current block: offset in pos_
  std::size_t pos_block_ = SIZE_MAX;       // block pos_starts_ describes
};

}  // namespace lode
