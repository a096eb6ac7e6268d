// Required and excluded clauses (+word, -word, "phrases") checked per
// candidate document with their own cursors, which only move forward: callers
// must ask about documents in increasing order.
#pragma once

#include <memory>
#include <vector>

#include "lode/index.h"
#include "lode/query.h"

namespace lode::rank {

class ClauseMatcher {
 public:
  // Cursors for the clause's words in each field it applies to.
  static Result<ClauseMatcher> create(IndexReader& reader, const Clause& clause);
  // True when `doc` contains the clause (the phrase, for phrase clauses) in
  // any of the clause's fields. REQUIRES: doc >= every doc asked before.
  Result<bool> contains(DocId doc);
  // The first document >= doc holding every word of the clause in one of its
  // fields (for a phrase, a candidate contains() still checks), or kNoDoc.
  // Lets a walk jump over documents that lack a required clause.
  // REQUIRES: doc >= every doc asked before (here or in contains()).
  Result<DocId> next(DocId doc);

 private:
  struct FieldCursors {
    std::vector<std::unique_ptr<PostingCursor>> words;  // empty: a word not in this field
    std::vector<std::uint32_t> offsets;
  };
  bool phrase_ = false;
  std::vector<FieldCursors> fields_;
};

}  // namespace lode::rank
