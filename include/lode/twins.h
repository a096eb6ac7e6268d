// lode/twins.h — near-duplicate documents across the whole index.
//
// Method (time well under quadratic):
//  1. MinHash: each live document's set of shingles gets `bands * rows`
//     minimum hash values (seeded 64-bit mixers). With `shingle` = 1 the
//     shingles are the document's `top_terms` heaviest index terms (TF-IDF
//     weight, read off the forward index): a cosine is dominated by the
//     heaviest terms, so near-duplicates share most of them, while unrelated
//     documents, which share mainly light, common words, rarely share them —
//     chance candidates then stay few as the archive grows;
//     with `shingle` = k > 1 they are runs of k consecutive index terms of the
//     stored text analyzed again (order-sensitive, slower).
//  2. LSH banding: documents whose `rows` values agree in any band become
//     candidate pairs. A pair with shingle-set Jaccard similarity J is a
//     candidate with probability 1 - (1 - J^rows)^bands (Broder 1997; Leskovec,
//     Rajaraman & Ullman, Mining of Massive Datasets, ch. 3).
//  3. Every candidate pair is verified by the exact cosine of the two TF-IDF
//     vectors (lode/vectors.h); pairs at or above `threshold` are kept and
//     joined into groups (union-find).
// Recall is therefore probabilistic: a pair above the cosine threshold whose
// shingle sets overlap little can be missed. Memory: one signature per live
// document (8 bytes x bands x rows); vectors are read again to verify.
//
// Thread safety: find_twins opens its own read scope on `reader`, which must
// have none active; one thread at a time per reader.
#pragma once

#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "lode/index.h"
#include "lode/status.h"
#include "lode/vectors.h"

namespace lode {

struct TwinOptions {
  VectorOptions vectors;
  double threshold = 0.9;      // minimum cosine of a reported pair, in (0, 1]
  std::size_t shingle = 1;     // words per shingle (1: index terms, no text re-read)
  std::size_t top_terms = 32;  // shingle 1: the heaviest terms hashed per document (0 = all)
  // 32 bands of 4 rows: a pair with shingle Jaccard 0.7 is a candidate with
  // p = 0.9998, 0.6 p = 0.988, 0.5 p = 0.87, 0.3 p = 0.23, 0.1 p = 0.003
  // (formula above). More rows: fewer chance candidates, less recall.
  std::size_t bands = 32;
  std::size_t rows = 4;
  std::uint64_t seed = 1;      // hash seeds; same seed, same index => same output
  // Called with (documents done, total) while signatures are computed.
  std::function<void(std::size_t, std::size_t)> progress;
  Status check() const;        // InvalidArgument naming the bad option
};

struct TwinPair {
  DocId a = 0, b = 0;          // a < b
  double similarity = 0;       // exact cosine
};

struct TwinGroup {
  std::vector<DocId> docs;     // ascending
  std::vector<std::string> external_ids;  // of docs, same order
  std::vector<TwinPair> pairs; // verified pairs inside the group, by (a, b)
  double min_similarity = 0, max_similarity = 0;  // over `pairs`
};

struct TwinReport {
  std::vector<TwinGroup> groups;   // largest first, then by first doc id
  std::size_t documents = 0;       // live documents examined
  std::size_t candidate_pairs = 0; // distinct pairs that shared a band
  std::size_t verified_pairs = 0;  // candidates at or above the threshold
};

// Near-duplicate groups of the whole index. InvalidArgument for bad options;
// index read errors.
Result<TwinReport> find_twins(IndexReader& reader, const TwinOptions& options);

}  // namespace lode
