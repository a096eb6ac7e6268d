// lode/keyterms.h — what a document, or a set of search hits, is about.
//
// The key terms of one document are the heaviest entries of its TF-IDF vector
// (lode/vectors.h); of several documents, the heaviest entries of the mean of
// their vectors (the centroid). A word's title and body dimensions are added
// together, so each stem is listed once. Stems are shown with their most
// frequent surface form: the source documents' stored text is analyzed again
// and each stem's folded, unstemmed words are counted (ties: the shorter,
// then alphabetically first word).
//
// Thread safety: each call opens its own read scope(s) on `reader`, which must
// have none active; one thread at a time per reader.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "lode/index.h"
#include "lode/ranking.h"
#include "lode/status.h"
#include "lode/vectors.h"

namespace lode {

struct KeyTermOptions {
  VectorOptions vectors;
  std::size_t top = 15;        // terms to return
  std::size_t hits = 50;       // key_terms_of_query: search hits to aggregate
  Status check() const;        // InvalidArgument naming the bad option
};

struct KeyTerm {
  std::string term;            // the index term (stem)
  std::string surface;         // its most frequent word in the source text
  double weight = 0;           // summed over fields; for several documents, the centroid's
  std::uint32_t occurrences = 0;  // tf summed over fields and source documents
  std::uint64_t df = 0;        // live documents containing it, largest over fields
};

struct KeyTermResults {
  std::vector<KeyTerm> terms;        // heaviest first; ties by term
  std::vector<DocId> documents;      // the source documents
  std::vector<std::string> warnings; // e.g. the query's dropped stopwords
};

// Key terms of live document `doc`. NotFound if it is not live.
Result<KeyTermResults> key_terms_of_document(IndexReader& reader, DocId doc, const KeyTermOptions& options);

// Key terms of the top `options.hits` hits of `query` searched with `search`
// (its top/offset are replaced). The search runs in its own snapshot; a hit
// removed before the second snapshot is skipped. Errors: those of
// Searcher::search; NotFound when the query matches nothing.
Result<KeyTermResults> key_terms_of_query(IndexReader& reader, std::string_view query, const SearchOptions& search,
                                          const KeyTermOptions& options);

}  // namespace lode
