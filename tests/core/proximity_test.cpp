// BM25TP term proximity (Büttcher, Clarke & Lushman 2006; lode/ranking.h,
// ProximityOptions): the proximity parts worked out here by hand from the
// paper's definition on a corpus whose word positions are known, and the
// breakdown rows adding up to the score. Pruning with proximity is checked
// against the exhaustive walk in pruning_test.cpp.
#include <cmath>

#include "util.h"

using namespace lode;
using namespace lode::test;

namespace {

// The paper's accumulator part of one word: min(1, w) * acc * (k1+1) / (acc + K),
// K = k1 * (1 - b + b * len / avglen).
double part(double w, double acc, double len, double avg) {
  const double k1 = 1.2, b = 0.75;
  return std::min(1.0, w) * acc * (k1 + 1) / (acc + k1 * (1 - b + b * len / avg));
}

}  // namespace

TEST_CASE("BM25TP adds the paper's proximity parts to BM25, row by row") {
  TempDir dir;
  const std::string path = dir.str("p.sqlite");
  build_index(path,
              {{"", "alpha beta gamma"},          // d1: alpha, beta adjacent
               {"", "alpha gamma gamma beta"},    // d2: three apart
               {"", "beta delta"},                // d3: one query word only
               {"", "delta epsilon"}},            // d4: none
              AnalyzerOptions{"none", false});
  OpenIndex idx = open_index(path);
  SearchOptions plain;
  plain.snippets = false;
  SearchOptions near = plain;
  near.proximity.enabled = true;
  auto base = idx.searcher->search("alpha beta", plain);
  auto prox = idx.searcher->search("alpha beta", near);
  REQUIRE(base.ok());
  REQUIRE(prox.ok());
  std::map<std::string, double> bm25;
  for (auto& h : base->hits) bm25[h.external_id] = h.score;
  const double n = 4, avg = (3 + 4 + 2 + 2) / 4.0;
  const double w_alpha = std::log(n / 2), w_beta = std::log(n / 3);
  std::map<std::string, double> want = {
      {"d1", bm25["d1"] + part(w_alpha, w_beta / 1, 3, avg) + part(w_beta, w_alpha / 1, 3, avg)},
      {"d2", bm25["d2"] + part(w_alpha, w_beta / 9, 4, avg) + part(w_beta, w_alpha / 9, 4, avg)},
      {"d3", bm25["d3"]}};
  REQUIRE(prox->hits.size() == 3);
  CHECK(prox->hits[0].external_id == "d1");
  for (const Hit& h : prox->hits) {
    CAPTURE(h.external_id);
    CHECK(h.score == doctest::Approx(want.at(h.external_id)).epsilon(1e-12));
    double sum = 0;
    int rows = 0;
    for (const TermContribution& c : h.breakdown) {
      sum += c.contribution;
      rows += c.proximity;
      if (c.proximity) CHECK(c.contribution == c.idf * c.tf_part);
    }
    CHECK(sum == h.score);  // the same additions in the same order
    CHECK(rows == (h.external_id == "d3" ? 0 : 2));
  }
  // Proximity is a BM25 option only.
  SearchOptions tfidf = near;
  tfidf.model = Model::kTfIdf;
  CHECK(!idx.searcher->search("alpha beta", tfidf).ok());
}
