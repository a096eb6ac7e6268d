// One clause against one document (lode/clause_check.h), with the matcher
// search uses.
#include "lode/clause_check.h"
#include "ranking/constraint.h"

namespace lode {

Result<bool> clause_holds(IndexReader& reader, const Clause& clause, DocId doc) {
  auto m = rank::ClauseMatcher::create(reader, clause);
  if (!m) return m.status();
  return m->contains(doc);
}

}  // namespace lode
