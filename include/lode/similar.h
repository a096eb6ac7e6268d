// lode/similar.h — documents like a given document or passage.
//
// Method: the source's TF-IDF vector (lode/vectors.h); its `query_terms`
// heaviest terms find the `candidates` documents with the best partial dot
// product divided by sqrt(1 + document length) (a cheap stand-in for the
// vector norm), by the same pruned document-at-a-time retrieval as search
// (lode/topk.h: block-max bounds skip documents that cannot reach the
// candidates); those are re-scored by the exact cosine of the full vectors
// and the top ones returned. Cost grows with the postings of a few, mostly
// rare, terms plus `candidates` forward-index reads.
// The similarity printed is always the exact cosine; only the choice of
// candidates is approximate (a document sharing none of the heaviest terms
// is never found).
//
// Thread safety: each call opens its own read scope on `reader`, so the
// reader must have none active; one thread at a time per reader.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "lode/index.h"
#include "lode/status.h"
#include "lode/vectors.h"

namespace lode {

struct SimilarOptions {
  VectorOptions vectors;
  std::size_t top = 10;            // documents to return
  std::size_t query_terms = 30;    // heaviest source terms used to find candidates;
                                   // more finds more, costs postings reads
  std::size_t candidates = 500;    // candidates re-scored exactly (>= top)
  std::size_t shared_terms = 5;    // shared terms listed per hit
  Status check() const;            // InvalidArgument naming the bad option
};

// One shared dimension's share of a similarity: source weight x document
// weight. A hit's shared terms are its largest shares (they sum to at most
// the similarity; all shares together sum to it exactly).
struct SharedTerm {
  std::string term;
  Field field = Field::kBody;
  double share = 0;
};

struct SimilarHit {
  DocId doc = 0;
  std::string external_id;
  std::string title;
  std::string path;
  double similarity = 0;           // exact cosine in [0, 1]
  std::vector<SharedTerm> shared;  // largest shares first
};

struct SimilarResults {
  std::vector<SimilarHit> hits;        // best first; ties by lower doc id
  std::size_t candidates = 0;          // documents scored exactly
  std::vector<std::string> query_terms;  // "field:term" of the terms that found candidates
};

// Documents most like live document `doc` (never `doc` itself). NotFound if
// `doc` is not live; InvalidArgument for bad options; index read errors.
Result<SimilarResults> similar_to_document(IndexReader& reader, DocId doc, const SimilarOptions& options);
// Documents most like a passage of text (analyzed with the index's analyzer).
// InvalidArgument when the passage has no word the index knows.
Result<SimilarResults> similar_to_text(IndexReader& reader, std::string_view text, const SimilarOptions& options);

// The live document named by `name`: its external id (as search prints it),
// else "#N" for document id N. NotFound with the name otherwise. Opens its
// own read scope, like the calls above.
Result<DocId> resolve_document(IndexReader& reader, std::string_view name);

}  // namespace lode
