// lode/vectors.h — TF-IDF document vectors read off the forward index.
//
// The explore features (similar documents, key terms, near-duplicates, topic
// groups) all compare documents as vectors built here, so they agree with one
// another and with the ranking: the weights are ranking.h's smart_tf and
// smart_idf, with the collection's current df.
//
// A vector has one dimension per (field, term) pair — a TermId — so a word in
// a title and the same word in a body are separate dimensions. Each field's
// weights are multiplied by its field weight, then the whole vector is
// l2-normalised: the dot product of two vectors is their cosine similarity.
//
// Thread safety: a VectorSource wraps one IndexReader (single-threaded) and
// caches term statistics; use it from one thread, inside one read scope.
#pragma once

#include <array>
#include <memory>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "lode/analysis.h"
#include "lode/index.h"
#include "lode/status.h"

namespace lode {

struct VectorOptions {
  // SMART tf and idf letters (ranking.h): default 'l' (1 + log tf) and 't'
  // (log N/df), the usual document-to-document choice ("ltc" both sides);
  // the normalisation is always cosine.
  char tf = 'l';
  char idf = 't';
  double log_base = 10.0;
  // Weight of each field's dimensions. Default title 1, body 1, as in search.
  std::array<double, kFieldCount> field_weight = {1.0, 1.0};
  // InvalidArgument naming the option when a letter or weight is out of range.
  Status check() const;
};

struct TermWeight {
  TermId term = 0;
  double weight = 0;
};
// Sorted by term id, no zero weights, Euclidean length 1 (or empty).
using SparseVector = std::vector<TermWeight>;

// Cosine of two SparseVectors (their dot product).
double cosine(const SparseVector& a, const SparseVector& b);
// Ids of the live documents, ascending. REQUIRES: an active read scope.
std::vector<DocId> live_documents(IndexReader& reader);
// The `n` entries with the largest weights, heaviest first (ties: lower term id).
SparseVector heaviest(const SparseVector& v, std::size_t n);

class VectorSource {
 public:
  // REQUIRES: options.check() is ok; `reader` outlives this and has an active
  // read scope while any method runs.
  VectorSource(IndexReader& reader, const VectorOptions& options);

  const VectorOptions& options() const { return options_; }
  IndexReader& reader() { return reader_; }

  // The vector of a live document. NotFound if `doc` is not live.
  Result<SparseVector> document(DocId doc);
  // The vector of a passage analyzed with the index's analyzer; every word
  // counts in each field with a non-zero weight. Words no live document has
  // are left out (they have no idf). Empty if nothing is left.
  Result<SparseVector> passage(std::string_view text, Analyzer& analyzer);

  // The term's statistics, cached for the life of this object.
  Result<const TermInfo*> term(TermId id);
 private:
  Status weigh(const std::vector<std::pair<TermId, std::uint32_t>>& tfs, Field field, double length,
               SparseVector& out);

  IndexReader& reader_;
  VectorOptions options_;
  double n_docs_;
  std::unordered_map<TermId, TermInfo> terms_;
};

}  // namespace lode
