// bench/varint_baseline.h — the naive reference for query latency: an
// exhaustive one-field BM25 over plain varint blobs held in memory.
//
// Before timing, every body-field term of the query set has its postings
// copied out of the index into one blob of LEB128 (doc gap, tf) pairs, and
// the body lengths into a flat array. A timed query then decodes each of its
// terms' blobs whole, adds k1 = 1.2, b = 0.75 BM25 contributions (the idf of
// lode/ranking.h) into a dense accumulator, and selects the top k from the
// documents it touched. No pruning, no fields, no syntax: words are bare
// words ("+", "-" and quotes are dropped; an excluded word still scores), so
// it does at least the work any exhaustive disjunctive evaluation must.
//
// Thread safety: one thread.
#pragma once

#include <string>
#include <unordered_map>
#include <vector>

#include "lode/analysis.h"
#include "lode/index.h"
#include "lode/status.h"

namespace lode::bench {

class VarintBaseline {
 public:
  // Copies the postings of every body term in `queries` (REQUIRES: an
  // active read scope on `reader`).
  static Result<VarintBaseline> build(IndexReader& reader, Analyzer& analyzer, const std::vector<std::string>& queries);
  // Ranks one query exhaustively; returns the number of documents scored.
  long long run(const std::string& query, std::size_t k);
  std::size_t bytes() const;

 private:
  struct Term {
    std::string blob;
    double idf = 0;
  };
  std::vector<std::string> terms_of(const std::string& query) const;

  Analyzer* analyzer_ = nullptr;
  std::unordered_map<std::string, Term> terms_;
  std::vector<std::uint32_t> length_;  // body length per doc id
  double average_ = 0;
  std::vector<float> acc_;
  std::vector<DocId> touched_;
};

}  // namespace lode::bench
