// BM25TP term proximity (lode/ranking.h, ProximityOptions): per query, the
// body words' accumulators from their positions in a document, the parts
// they add to the BM25 score and the bounds that keep pruning exact.
#pragma once

#include <memory>
#include <vector>

#include "lode/index.h"
#include "lode/ranking.h"

namespace lode::rank {

struct ScoringTerm;

class Proximity {
 public:
  // Off (every part and bound 0) unless options.proximity.enabled and the
  // model is BM25. Only body terms present in the index take part.
  Proximity(IndexReader& reader, const SearchOptions& options, const std::vector<ScoringTerm>& terms);

  bool enabled() const { return enabled_; }
  // Upper bound of term i's proximity part in any document: min(1, w) * (k1 + 1).
  double bound(std::size_t i) const { return enabled_ ? cap_[i] : 0.0; }
  // Adds `doc`'s proximity parts to `total` (tfs[i] = term i's tf in doc) and,
  // when `out` is given, one row per word with a non-zero part. Reads the
  // words' positions through cursors of its own (forward from the last doc
  // asked, reopened when asked for an earlier one). Errors: index reads.
  Status add(DocId doc, const std::vector<std::uint32_t>& tfs, const DocNorms& norms, double& total,
             std::vector<TermContribution>* out);

 private:
  Status positions(std::size_t i, DocId doc, std::vector<std::uint32_t>& out);

  IndexReader& reader_;
  const SearchOptions& options_;
  const std::vector<ScoringTerm>& terms_;
  bool enabled_ = false;
  double avg_length_ = 0;                      // average body length
  std::vector<double> w_, cap_;                // per term: ln(N/df), bound (0: not a body term)
  std::vector<std::unique_ptr<PostingCursor>> cursors_;
  std::vector<std::pair<std::uint32_t, std::size_t>> occurrences_;  // scratch: (position, term)
  std::vector<std::uint32_t> scratch_;
  std::vector<double> acc_;
};

}  // namespace lode::rank
