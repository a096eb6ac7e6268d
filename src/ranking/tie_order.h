// The order users see: score descending, equal scores by the document id
// users see (the JSON Lines id or relative path), never by the internal doc
// id, which depends on the order documents were indexed in. An incremental
// index and a fresh build of the same files therefore list the same hits.
#pragma once

#include <vector>

#include "lode/index.h"
#include "lode/status.h"
#include "lode/topk.h"

namespace lode::rank {

// Orders `ranked` (best first as lode/topk.h returns it, which may hold more
// than `keep` entries when documents tie with the keep-th score) by score
// descending, then external id ascending, then cuts it to `keep`. Looks up
// external ids only for documents whose score another document shares.
// Errors: those of IndexReader::document.
Status order_by_visible_id(IndexReader& reader, std::vector<ScoredDoc>& ranked, std::size_t keep);

}  // namespace lode::rank
