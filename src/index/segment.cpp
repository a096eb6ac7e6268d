#include "index/segment.h"

#include <algorithm>

#include "index/bitpack.h"
#include "index/codec.h"

namespace lode::codec {

std::vector<BoundPoint> bound_frontier(std::vector<BoundPoint> points, std::size_t cap) {
  // Descending tf, then ascending length: a point survives when it is
  // shorter than every point with a higher (or equal) tf before it.
  std::sort(points.begin(), points.end(),
            [](const BoundPoint& a, const BoundPoint& b) { return a.tf != b.tf ? a.tf > b.tf : a.length < b.length; });
  std::vector<BoundPoint> front;
  for (const BoundPoint& p : points)
    if (front.empty() || p.length < front.back().length) front.push_back(p);
  std::reverse(front.begin(), front.end());  // ascending tf and length
  while (front.size() > std::max<std::size_t>(cap, 1)) {
    // Merge the neighbours whose corner loosens the bound least: the
    // smallest relative step in tf plus length.
    std::size_t best = 0;
    double best_cost = 0;
    for (std::size_t i = 0; i + 1 < front.size(); ++i) {
      const double cost = static_cast<double>(front[i + 1].tf - front[i].tf) / front[i + 1].tf +
                          static_cast<double>(front[i + 1].length - front[i].length) / front[i + 1].length;
      if (i == 0 || cost < best_cost) best = i, best_cost = cost;
    }
    front[best].tf = front[best + 1].tf;
    front.erase(front.begin() + static_cast<std::ptrdiff_t>(best) + 1);
  }
  return front;
}

void SegmentBuilder::add(DocId doc, std::uint32_t tf, std::uint32_t length, std::string_view positions) {
  if (pending_docs_.empty()) pending_pos_start_ = out_.positions.size();
  if (out_.count == 0 && pending_docs_.empty()) out_.first_doc = doc;
  pending_docs_.push_back(doc);
  pending_tfs_.push_back(tf);
  if (length > 0) pending_points_.push_back(BoundPoint{tf, std::max(length, tf)});
  out_.positions.append(positions);
  if (pending_docs_.size() == kBlockSize) close_block();
}

void SegmentBuilder::add_points(std::span<const BoundPoint> points) {
  pending_points_.insert(pending_points_.end(), points.begin(), points.end());
}

void SegmentBuilder::put_header(std::uint32_t n, DocId last, std::size_t bytes, std::size_t pos_bytes,
                                const std::vector<BoundPoint>& points) {
  put_varint(body_, n);
  put_varint(body_, last - (blocks_ == 0 ? out_.first_doc : last_));
  put_varint(body_, bytes);
  put_varint(body_, pos_bytes);
  put_varint(body_, points.size());
  for (const BoundPoint& p : points) {
    put_varint(body_, p.tf);
    put_varint(body_, p.length);
  }
  last_ = last;
  out_.last_doc = last;
  out_.count += n;
  ++blocks_;
}

void SegmentBuilder::close_block() {
  const auto n = static_cast<std::uint32_t>(pending_docs_.size());
  if (n == 0) return;
  // Gaps minus one, and tfs minus one, each at the width of its largest.
  scratch_.resize(n);
  DocId prev = blocks_ == 0 ? out_.first_doc - 1 : last_;
  std::uint32_t max_gap = 0, max_tf = 0;
  for (std::uint32_t i = 0; i < n; ++i) {
    scratch_[i] = pending_docs_[i] - prev - 1;
    prev = pending_docs_[i];
    max_gap = std::max(max_gap, scratch_[i]);
    max_tf = std::max(max_tf, pending_tfs_[i] - 1);
  }
  const std::size_t start = out_.data.size();
  const unsigned dbits = bits_for(max_gap), tbits = bits_for(max_tf);
  out_.data.push_back(static_cast<char>(dbits));
  out_.data.push_back(static_cast<char>(tbits));
  pack(out_.data, scratch_.data(), n, dbits);
  for (std::uint32_t i = 0; i < n; ++i) scratch_[i] = pending_tfs_[i] - 1;
  pack(out_.data, scratch_.data(), n, tbits);
  put_header(n, pending_docs_.back(), out_.data.size() - start, out_.positions.size() - pending_pos_start_,
             bound_frontier(std::move(pending_points_)));
  pending_docs_.clear();
  pending_tfs_.clear();
  pending_points_.clear();
}

void SegmentBuilder::add_block(const PostingList& list, std::size_t b, std::string_view pos) {
  const PostingList::Block& blk = list.blocks()[b];
  if (out_.count == 0) out_.first_doc = blk.before + 1;
  const std::string& data = list.segments()[blk.segment].data;
  // Its packed gaps start from blk.before, which must be this segment's
  // previous last doc (or first_doc - 1): true when blocks are copied in order
  // from the start of a list's segment.
  out_.data.append(data, blk.offset, blk.bytes);
  out_.positions.append(pos);
  const auto pts = list.points(blk);
  put_header(blk.n, blk.last, blk.bytes, pos.size(), std::vector<BoundPoint>(pts.begin(), pts.end()));
}

BuiltSegment SegmentBuilder::finish() {
  close_block();
  std::string head;
  put_varint(head, blocks_);
  head += body_;
  out_.head = std::move(head);
  BuiltSegment done = std::move(out_);
  *this = SegmentBuilder();
  return done;
}

}  // namespace lode::codec
