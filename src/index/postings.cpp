// PostingList: decoding of stored segments (docs/index-format.md, format 4);
// PostingCursor's block moves and positions.
#include "lode/postings.h"

#include <algorithm>

#include "index/bitpack.h"
#include "index/codec.h"
#include "index/segment.h"

namespace lode {

Result<std::shared_ptr<const PostingList>> PostingList::build(std::vector<StoredSegment> segments,
                                                               const std::string& what) {
  auto list = std::make_shared<PostingList>();
  list->what_ = what;
  DocId prev_last = 0;
  for (std::size_t s = 0; s < segments.size(); ++s) {
    StoredSegment& seg = segments[s];
    const std::string where = what + " segment at doc " + std::to_string(seg.first_doc);
    auto bad = [&](const char* why) { return Status::Corruption("postings of " + where + ": " + why); };
    if (seg.first_doc == 0 || seg.first_doc <= prev_last || seg.last_doc < seg.first_doc)
      return bad("document range out of order");
    codec::Reader r(seg.head);
    std::uint64_t nblocks = 0;
    if (!r.varint(nblocks) || nblocks == 0 || nblocks > kSegmentBlocks) return bad("bad block count");
    DocId before = seg.first_doc - 1;
    std::uint64_t offset = 0, pos_offset = 0, count = 0;
    for (std::uint64_t b = 0; b < nblocks; ++b) {
      std::uint64_t n = 0, gap = 0, bytes = 0, pos_bytes = 0, npoints = 0;
      if (!r.varint(n) || !r.varint(gap) || !r.varint(bytes) || !r.varint(pos_bytes) || !r.varint(npoints))
        return bad("truncated block header");
      if (n == 0 || n > kBlockSize) return bad("bad block size");
      if (npoints == 0 || npoints > kMaxBoundPoints) return bad("bad bound point count");
      // Block 0's last doc is counted from first_doc, later ones from the previous last.
      const std::uint64_t last = (b == 0 ? std::uint64_t{seg.first_doc} : std::uint64_t{before}) + gap;
      if ((b > 0 && gap == 0) || last > seg.last_doc || last - before < n) return bad("block range out of order");
      Block blk;
      blk.before = before;
      blk.last = static_cast<DocId>(last);
      blk.segment = static_cast<std::uint32_t>(s);
      blk.offset = static_cast<std::uint32_t>(offset);
      blk.bytes = static_cast<std::uint32_t>(bytes);
      blk.pos_offset = static_cast<std::uint32_t>(pos_offset);
      blk.pos_bytes = static_cast<std::uint32_t>(pos_bytes);
      blk.points = static_cast<std::uint32_t>(list->points_.size());
      blk.n = static_cast<std::uint16_t>(n);
      blk.point_count = static_cast<std::uint8_t>(npoints);
      for (std::uint64_t p = 0; p < npoints; ++p) {
        BoundPoint pt;
        if (!r.varint32(pt.tf) || !r.varint32(pt.length) || pt.tf == 0) return bad("bad bound point");
        list->points_.push_back(pt);
      }
      offset += bytes;
      pos_offset += pos_bytes;
      count += n;
      if (offset > seg.data.size() || pos_offset > 0xffffffffu) return bad("block data past the segment's end");
      list->blocks_.push_back(blk);
      before = blk.last;
    }
    if (!r.at_end()) return bad("trailing header bytes");
    if (offset != seg.data.size()) return bad("block sizes do not add up to the data");
    if (before != seg.last_doc || count != seg.count) return bad("last document or count does not match");
    list->postings_ += count;
    list->segments_.push_back(Segment{seg.key, std::move(seg.data)});
    prev_last = seg.last_doc;
  }
  list->list_points_ = codec::bound_frontier(list->points_, kMaxListPoints);
  return std::shared_ptr<const PostingList>(std::move(list));
}

std::size_t PostingList::memory() const {
  std::size_t total = sizeof(*this) + blocks_.capacity() * sizeof(Block) + points_.capacity() * sizeof(BoundPoint);
  for (const Segment& s : segments_) total += sizeof(Segment) + s.data.capacity();
  return total;
}

Status PostingList::decode(std::size_t b, DocId* docs, std::uint32_t* tfs) const {
  const Block& blk = blocks_[b];
  const std::string& data = segments_[blk.segment].data;
  const auto* p = reinterpret_cast<const unsigned char*>(data.data()) + blk.offset;
  auto bad = [&]() {
    return Status::Corruption("postings block of " + what_ + " ending at doc " + std::to_string(blk.last) +
                              ": bad packed data");
  };
  if (blk.bytes < 2) return bad();
  const unsigned dbits = p[0], tbits = p[1];
  if (dbits > codec::kMaxPackWidth || tbits > codec::kMaxPackWidth) return bad();
  const std::size_t dbytes = codec::packed_bytes(blk.n, dbits), tbytes = codec::packed_bytes(blk.n, tbits);
  if (2 + dbytes + tbytes != blk.bytes) return bad();
  codec::unpack(p + 2, dbytes, docs, blk.n, dbits);
  codec::unpack(p + 2 + dbytes, tbytes, tfs, blk.n, tbits);
  // Gaps minus one to documents; the sum is checked in 64 bits against the
  // header's last document, so damaged data cannot wrap around unnoticed.
  std::uint64_t sum = 0;
  DocId d = blk.before;
  for (std::uint32_t i = 0; i < blk.n; ++i) {
    sum += docs[i];
    d += docs[i] + 1;
    docs[i] = d;
    tfs[i] += 1;
  }
  if (sum + blk.n != std::uint64_t{blk.last} - blk.before) return bad();
  return Status();
}

PostingCursor::PostingCursor(std::shared_ptr<const PostingList> list, PositionSource* positions)
    : list_(std::move(list)), positions_source_(positions) {
  if (list_ && !list_->blocks().empty()) enter(0, 0);
}

std::size_t PostingCursor::find_block(DocId target) const {
  const auto blocks = list_->blocks();
  // Gallop from the next block, then binary search the bracket: seeks are
  // mostly short (the next block or two) but may jump far.
  std::size_t lo = block_ + 1, step = 1;
  while (lo + step < blocks.size() && blocks[lo + step - 1].last < target) {
    lo += step;
    step *= 2;
  }
  const std::size_t hi = std::min(blocks.size(), lo + step);
  return static_cast<std::size_t>(
      std::lower_bound(blocks.begin() + static_cast<std::ptrdiff_t>(lo), blocks.begin() + static_cast<std::ptrdiff_t>(hi),
                       target, [](const PostingList::Block& b, DocId t) { return b.last < t; }) -
      blocks.begin());
}

void PostingCursor::enter(std::size_t b, DocId target) {
  valid_ = false;
  if (!status_.ok() || b >= list_->blocks().size()) return;
  status_ = list_->decode(b, docs_, tfs_);
  if (!status_.ok()) return;
  block_ = b;
  n_ = list_->blocks()[b].n;
  i_ = 0;
  while (docs_[i_] < target) ++i_;  // the block's last doc is >= target
  valid_ = true;
}

Result<std::vector<std::uint32_t>> PostingCursor::positions() {
  const PostingList::Block& blk = list_->blocks()[block_];
  const PostingList::Segment& seg = list_->segments()[blk.segment];
  if (pos_segment_ != seg.key) {
    if (!positions_source_) return Status::InvalidArgument("this postings cursor has no positions");
    auto blob = positions_source_->segment_positions(seg.key);
    if (!blob) return blob.status();
    pos_ = std::move(blob).value();
    pos_segment_ = seg.key;
    pos_block_ = SIZE_MAX;
  }
  if (pos_block_ != block_) {
    if (std::uint64_t{blk.pos_offset} + blk.pos_bytes > pos_.size())
      return Status::Corruption("positions of a postings block ending at doc " + std::to_string(blk.last) +
                                ": past the segment's positions");
    const std::string_view slice = std::string_view(pos_).substr(blk.pos_offset, blk.pos_bytes);
    LODE_RETURN_IF_ERROR(codec::split_positions(slice, std::vector<std::uint32_t>(tfs_, tfs_ + n_), pos_starts_));
    for (auto& s : pos_starts_) s += blk.pos_offset;
    pos_block_ = block_;
  }
  std::vector<std::uint32_t> out;
  LODE_RETURN_IF_ERROR(codec::decode_positions(pos_, pos_starts_[i_], tfs_[i_], out));
  return out;
}

}  // namespace lode
