// What a sift covers and how its engine is rebuilt from saved judgments.
#pragma once

#include <string>
#include <vector>

#include "lode/screening.h"

namespace lode::screening {

struct Scope {
  std::vector<DocId> docs;  // live documents meeting the query's @filters (all live ones without)
  std::string words;        // the query's ranked and required words as text: the synthetic document
};
// Parses `query` with the index's analyzer. REQUIRES: an active read scope.
Result<Scope> sift_scope(IndexReader& reader, const std::string& query);

// An engine over the sift's scope with its current judgments applied.
Result<std::unique_ptr<SiftEngine>> sift_engine(IndexReader& reader, const std::string& query,
                                                const SiftOptions& options,
                                                const std::vector<SiftJudgment>& judgments);

}  // namespace lode::screening
