// BM25 against hand computation from the published formula: Robertson &
// Zaragoza, "The Probabilistic Relevance Framework: BM25 and Beyond" (2009),
// eq. for w(tf) with k1, b and the RSJ idf; lode uses idf = ln(1 + (N-df+0.5)/(df+0.5)).
#include <cmath>

#include "util.h"

using namespace lode;
using namespace lode::test;

TEST_CASE("BM25 scores equal a hand computation, including a term with df > N/2") {
  // Four documents, no stemming or stopwords, titles empty. Lengths 4, 2, 6, 3.
  TempDir dir;
  std::string path = dir.str("bm25.sqlite");
  build_index(path,
              {{"", "tide gauge tide log"}, {"", "tide chart"}, {"", "lamp lamp lamp oil wick tide"}, {"", "fog horn log"}},
              AnalyzerOptions{"none", false});
  auto reader = IndexReader::open(path);
  REQUIRE(reader.ok());
  const double n = 4, avgdl = (4 + 2 + 6 + 3) / 4.0;
  const double k1 = 1.2, b = 0.75;
  auto part = [&](double tf, double dl) { return tf * (k1 + 1) / (tf + k1 * (1 - b + b * dl / avgdl)); };
  // "tide": df = 3 > N/2. The raw RSJ weight log((N-df+0.5)/(df+0.5)) would be
  // log(1.5/3.5) < 0; lode's form stays positive.
  double idf_tide = std::log(1 + (n - 3 + 0.5) / (3 + 0.5));
  double idf_log = std::log(1 + (n - 2 + 0.5) / (2 + 0.5));
  CHECK(idf_tide > 0);
  CHECK(std::log((n - 3 + 0.5) / (3 + 0.5)) < 0);
  SearchOptions o;
  o.field_weight = {0.0, 1.0};
  auto s = scores_of(**reader, "tide log", o);
  REQUIRE(s.size() == 4);
  CHECK(std::abs(s["d1"] - (idf_tide * part(2, 4) + idf_log * part(1, 4))) < 1e-12);
  CHECK(std::abs(s["d2"] - idf_tide * part(1, 2)) < 1e-12);
  CHECK(std::abs(s["d3"] - idf_tide * part(1, 6)) < 1e-12);
  CHECK(std::abs(s["d4"] - idf_log * part(1, 3)) < 1e-12);

  SUBCASE("k1 and b are per query") {
    SearchOptions p = o;
    p.bm25 = {2.0, 0.0};  // b = 0: no length normalisation
    auto t = scores_of(**reader, "lamp", p);
    double idf_lamp = std::log(1 + (n - 1 + 0.5) / (1 + 0.5));
    CHECK(std::abs(t["d3"] - idf_lamp * 3 * 3.0 / (3 + 2.0)) < 1e-12);
  }
  SUBCASE("repeated query words multiply the weight (qtf)") {
    auto t = scores_of(**reader, "chart chart", o);
    double idf_chart = std::log(1 + (n - 1 + 0.5) / (1 + 0.5));
    CHECK(std::abs(t["d2"] - 2 * idf_chart * part(1, 2)) < 1e-12);
  }
}

TEST_CASE("breakdown contributions sum to the score and carry the statistics") {
  TempDir dir;
  std::string path = dir.str("bd.sqlite");
  build_index(path, {{"Storm log", "storm storm surge on the north quay"}, {"Kelp survey", "kelp beds after the storm"},
                     {"Lamp", "the lamp burned all night"}});
  auto reader = IndexReader::open(path);
  REQUIRE(reader.ok());
  auto searcher = Searcher::create(**reader);
  REQUIRE(searcher.ok());
  for (FieldScoring fields : {FieldScoring::kJoint, FieldScoring::kSum})
  for (Model m : {Model::kBm25, Model::kTfIdf}) {
    SearchOptions o;
    o.model = m;
    o.fields = fields;
    auto r = (*searcher)->search("storm kelp night", o);
    REQUIRE(r.ok());
    REQUIRE(r->hits.size() == 3);
    for (auto& h : r->hits) {
      double sum = 0;
      for (auto& c : h.breakdown) sum += c.contribution;
      CHECK(std::abs(sum - h.score) < 1e-9);
      CHECK(!h.breakdown.empty());
    }
    const Hit* d1 = nullptr;
    for (auto& h : r->hits)
      if (h.external_id == "d1") d1 = &h;
    REQUIRE(d1 != nullptr);
    bool saw_title = false;
    for (auto& c : d1->breakdown)
      if (c.field == Field::kTitle && c.term == "storm") {
        saw_title = true;
        CHECK(c.tf == 1);
        // Joint fields (the default, BM25F or one TF-IDF vector) count
        // documents with "storm" in any field (d1, d2); summed fields score
        // each field alone (title: d1 only).
        CHECK(c.df == (fields == FieldScoring::kJoint ? 2u : 1u));
        CHECK(c.doc_length == 2);
      }
    CHECK(saw_title);
  }
}

// BM25F: Robertson, Zaragoza & Taylor, "Simple BM25 extension to multiple
// weighted fields" (CIKM 2004): per-field length-normalised tfs, weighted,
// added, then saturated once; idf from documents with the term in any field.
// Here every field uses the same b. Computed by hand from that formula.
TEST_CASE("joint fields (BM25F) equal a hand computation / the sum mode scores fields apart") {
  TempDir dir;
  std::string path = dir.str("bm25f.sqlite");
  build_index(path,
              {{"storm log", "storm storm surge quay"}, {"kelp survey", "kelp beds after storm"},
               {"lamp", "lamp burned all night"}},
              AnalyzerOptions{"none", false});
  auto reader = IndexReader::open(path);
  REQUIRE(reader.ok());
  const double n = 3, k1 = 1.2, b = 0.75, avg_title = 5.0 / 3.0, avg_body = 4.0;
  auto norm = [&](double len, double avg) { return 1 - b + b * len / avg; };
  auto idf = [&](double df) { return std::log(1 + (n - df + 0.5) / (df + 0.5)); };
  auto sat = [&](double x) { return x * (k1 + 1) / (x + k1); };

  SearchOptions o;  // defaults: joint, title weight 2, body weight 1
  REQUIRE(o.fields == FieldScoring::kJoint);
  const double wt = o.field_weight[0], wb = o.field_weight[1];
  auto searcher = Searcher::create(**reader);
  REQUIRE(searcher.ok());
  auto r = (*searcher)->search("storm", o);
  REQUIRE(r.ok());
  REQUIRE(r->hits.size() == 2);
  // "storm": title of d1, body of d1 (tf 2) and d2: in 2 documents of 3.
  const double x1 = wt * 1 / norm(2, avg_title) + wb * 2 / norm(4, avg_body);
  const double x2 = wb * 1 / norm(4, avg_body);
  const Hit& h1 = r->hits[0];
  CHECK(h1.external_id == "d1");
  CHECK(std::abs(h1.score - idf(2) * sat(x1)) < 1e-12);
  CHECK(r->hits[1].external_id == "d2");
  CHECK(std::abs(r->hits[1].score - idf(2) * sat(x2)) < 1e-12);
  // d1's breakdown: each field's share of x, and the shares add up to the score.
  REQUIRE(h1.breakdown.size() == 2);
  double sum = 0;
  for (const TermContribution& c : h1.breakdown) {
    CHECK(c.df == 2);
    const double share = c.field == Field::kTitle ? wt * 1 / norm(2, avg_title) : wb * 2 / norm(4, avg_body);
    CHECK(std::abs(c.contribution - idf(2) * sat(x1) * share / x1) < 1e-12);
    sum += c.contribution;
  }
  CHECK(std::abs(sum - h1.score) < 1e-12);

  SUBCASE("sum: each field saturated alone with its own df, then weighted and added") {
    SearchOptions s = o;
    s.fields = FieldScoring::kSum;
    auto part = [&](double tf, double len, double avg) { return tf * (k1 + 1) / (tf + k1 * norm(len, avg)); };
    auto got = scores_of(**reader, "storm", s);
    CHECK(std::abs(got["d1"] - (wt * idf(1) * part(1, 2, avg_title) + wb * idf(2) * part(2, 4, avg_body))) < 1e-12);
    CHECK(std::abs(got["d2"] - wb * idf(2) * part(1, 4, avg_body)) < 1e-12);
  }
  SUBCASE("one field: joint equals plain BM25") {
    SearchOptions one = o;
    one.field_weight = {0.0, 1.0};
    auto got = scores_of(**reader, "storm", one);
    CHECK(std::abs(got["d1"] - idf(2) * sat(2 / norm(4, avg_body))) < 1e-12);
  }
}
