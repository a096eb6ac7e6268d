// RM3 pseudo-relevance feedback (the method and its sources: FeedbackOptions
// in include/lode/ranking.h). The Searcher runs the first pass; this file
// turns its top documents into the expanded list of scoring terms.
#pragma once

#include <vector>

#include "lode/index.h"
#include "lode/ranking.h"
#include "ranking/scorer.h"

namespace lode::rank {

struct FeedbackDoc {
  DocId doc = 0;
  double score = 0;  // first-pass score
};

// Rewrites `terms` (the first pass's scoring terms) into the RM3 mix over
// `docs`: original terms reweighted, expansion words added as bare words in
// every field whose weight is not 0. Looks up term statistics in `reader`
// (REQUIRES: an active read scope). No feedback documents, or none with a
// positive score or any words, leaves `terms` unchanged.
Status expand_rm3(IndexReader& reader, const SearchOptions& options, const std::vector<FeedbackDoc>& docs,
                  std::vector<ScoringTerm>& terms);

}  // namespace lode::rank
