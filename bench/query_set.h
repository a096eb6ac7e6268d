// bench/query_set.h — a fixed, seeded query set for bench_query.
//
// Candidate words come from the synthetic vocabulary (vocab.h, ranks drawn
// log-uniformly so both head and tail appear, inflected forms included) or,
// for an index of some other corpus, from the stored text of random
// documents. Each candidate is analyzed with the index's own analyzer and its
// body df looked up, then sorted by df: the top third are "frequent", the
// bottom third "rare" (so the labels describe this index, whatever it holds).
// Queries, by share of the set:
//   30% frequent  1-4 frequent words
//   25% rare      1-4 rare words
//   25% mixed     2-4 words, frequent and rare together
//    5% required  +frequent rare            5% excluded  frequent frequent -frequent
//   10% phrase    "2-3 adjacent words" cut from a random document's stored text
//
// Thread safety: uses the given reader and analyzer; one thread.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "lode/analysis.h"
#include "lode/index.h"
#include "lode/status.h"
#include "vocab.h"

namespace lode::bench {

struct BenchQuery {
  std::string text;  // in lode's query syntax
  std::string kind;  // "frequent", "rare", "mixed", "required", "excluded", "phrase"
};

struct QuerySetOptions {
  std::size_t count = 200;
  std::uint64_t seed = 7;
  std::size_t candidates = 4000;  // words looked up before bucketing by df
  // nullptr: draw candidate words from the index's stored text instead.
  const Vocabulary* vocabulary = nullptr;
};

// REQUIRES: no ReadScope is active on `reader` (one is opened inside).
// Errors: index read errors; InvalidArgument when the index is empty.
Result<std::vector<BenchQuery>> make_query_set(IndexReader& reader, Analyzer& analyzer,
                                               const QuerySetOptions& options);

}  // namespace lode::bench
