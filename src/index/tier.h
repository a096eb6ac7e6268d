// Building impact tiers (lode/postings.h ImpactTier) from a decoded list and
// the snapshot's field lengths. Store-neutral: the reader caches the result.
#pragma once

#include <cstdint>
#include <memory>

#include "lode/index.h"
#include "lode/postings.h"
#include "lode/status.h"

namespace lode {

struct TierOptions {
  // Lists with fewer postings get no tier: reading them whole is cheap.
  std::uint64_t min_postings = 8192;
  // The top part holds this share of the list's postings (1/32), so a
  // frequent word's walk reads ~3% of its postings once θ passes the rest.
  std::uint32_t share = 32;
};

// The tier of `list`, a list of `field`, or null when the list is shorter
// than options.min_postings (or has no live posting outside the top part to
// save). Postings are ranked by the BM25 length-normalised tf,
// tf / (0.25 + 0.75 * length / average_length) (b = 0.75, the common default:
// Robertson & Zaragoza 2009); dead documents are left out of both parts.
// Errors: Corruption from decoding the list.
Result<std::shared_ptr<const ImpactTier>> build_impact_tier(const PostingList& list, const DocNorms& norms,
                                                            Field field, double average_length,
                                                            const TierOptions& options);

}  // namespace lode
