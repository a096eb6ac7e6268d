// lode/clause_check.h — whether one clause of a parsed query holds for one
// document: the same test search applies to required (+), excluded (-) and
// phrase clauses, asked about a single document. For explanations (why a
// document is missing); search itself walks all candidates in order.
//
// Thread safety: uses the given reader (one thread, active read scope).
#pragma once

#include "lode/index.h"
#include "lode/query.h"

namespace lode {

// True when `doc` contains the clause's words (for a phrase: adjacent, in
// order) in any field the clause applies to. Errors: index read errors.
// REQUIRES: an active read scope on `reader`.
Result<bool> clause_holds(IndexReader& reader, const Clause& clause, DocId doc);

}  // namespace lode
