#include "index/tier.h"

#include <algorithm>
#include <unordered_map>
#include <vector>

#include "index/segment.h"

namespace lode {

Result<std::shared_ptr<const ImpactTier>> build_impact_tier(const PostingList& list, const DocNorms& norms,
                                                            Field field, double average_length,
                                                            const TierOptions& options) {
  if (list.postings() < options.min_postings || options.share == 0) return std::shared_ptr<const ImpactTier>();
  struct Posting {
    DocId doc;
    std::uint32_t tf, length;
    double impact;
  };
  std::vector<Posting> live;
  live.reserve(list.postings());
  DocId docs[kBlockSize];
  std::uint32_t tfs[kBlockSize];
  const double avg = average_length > 0 ? average_length : 1.0;
  for (std::size_t b = 0; b < list.blocks().size(); ++b) {
    LODE_RETURN_IF_ERROR(list.decode(b, docs, tfs));
    for (std::uint32_t j = 0; j < list.blocks()[b].n; ++j) {
      if (!norms.live(docs[j])) continue;
      const std::uint32_t length = std::max(norms.length(docs[j], field), tfs[j]);
      live.push_back(Posting{docs[j], tfs[j], length, tfs[j] / (0.25 + 0.75 * length / avg)});
    }
  }
  const std::size_t top = live.size() / options.share;
  if (top == 0 || top >= live.size()) return std::shared_ptr<const ImpactTier>();
  // The top part: the `top` largest impacts, ties by lower doc (deterministic).
  std::nth_element(live.begin(), live.begin() + static_cast<std::ptrdiff_t>(top), live.end(),
                   [](const Posting& a, const Posting& b) {
                     return a.impact != b.impact ? a.impact > b.impact : a.doc < b.doc;
                   });
  auto tier = std::make_shared<ImpactTier>();
  // The rest's frontier from the shortest length seen at each tf (a few
  // hundred points at most, not a million to sort).
  std::unordered_map<std::uint32_t, std::uint32_t> shortest;
  for (std::size_t j = top; j < live.size(); ++j) {
    auto [it, fresh] = shortest.try_emplace(live[j].tf, live[j].length);
    if (!fresh) it->second = std::min(it->second, live[j].length);
  }
  std::vector<BoundPoint> rest;
  for (auto [tf, length] : shortest) rest.push_back(BoundPoint{tf, length});
  tier->rest_points = codec::bound_frontier(std::move(rest), kMaxListPoints);
  live.resize(top);
  std::sort(live.begin(), live.end(), [](const Posting& a, const Posting& b) { return a.doc < b.doc; });
  std::vector<PostingList::StoredSegment> segments;
  codec::SegmentBuilder builder;
  auto flush = [&] {
    codec::BuiltSegment s = builder.finish();
    segments.push_back(PostingList::StoredSegment{-1, s.first_doc, s.last_doc, s.count, std::move(s.head),
                                                  std::move(s.data)});
  };
  for (const Posting& p : live) {
    if (builder.full()) flush();
    builder.add(p.doc, p.tf, p.length, {});
  }
  flush();
  auto built = PostingList::build(std::move(segments), "impact tier");
  if (!built) return built.status();
  tier->top = std::move(built).value();
  return std::shared_ptr<const ImpactTier>(std::move(tier));
}

}  // namespace lode
