// Topic groups: the k-means objective against a numpy / scikit-learn
// computation from the same initial centres, and the adjusted Rand index of
// the groups against invented topic labels (sklearn.metrics.adjusted_rand_score).
#include <nlohmann/json.hpp>

#include "fixture.h"
#include "corpus.h"
#include "explore/kmeans.h"
#include "lode/themes.h"

using namespace lode;
using namespace lode::test;

namespace {

// 4 invented topics x 30 documents; 45% topic words, the rest shared.
struct Labelled {
  std::vector<std::pair<std::string, std::string>> docs;
  std::vector<int> labels;
};
Labelled labelled_corpus() {
  std::mt19937_64 rng(5);
  auto common = invented_words("c", 400);
  Labelled out;
  for (int i = 0; i < 120; ++i) {
    int t = i % 4;
    auto topic = invented_words(std::string(1, static_cast<char>('p' + t)), 80);
    out.docs.push_back({"", invented_text(rng, topic, common, 70, 0.45)});
    out.labels.push_back(t);
  }
  return out;
}

}  // namespace

TEST_CASE("spherical k-means objective equals numpy's from the same initial centres") {
  auto corpus = labelled_corpus();
  TempDir dir;
  auto reader = open_built(dir, "th.sqlite", corpus.docs, kPlainWords);
  auto scope = reader->begin();
  REQUIRE(scope.ok());
  VectorSource src(*reader, VectorOptions{});
  auto rows = explore::load_rows(src, live_documents(*reader), 2);
  REQUIRE(rows.ok());
  for (std::uint64_t seed : {1u, 2u, 3u}) {
    CAPTURE(seed);
    std::size_t k = 3 + seed;  // 4, 5, 6 groups: more groups than topics make the iterations work
    auto centres = explore::kmeanspp(rows->rows, rows->columns.size(), k, seed);
    auto mine = explore::spherical_kmeans(rows->rows, centres, 100);
    CHECK(mine.converged);
    nlohmann::json in{{"rows", nlohmann::json::array()}, {"dims", rows->columns.size()},
                      {"centres", centres}, {"max_iterations", 100}};
    for (auto& r : rows->rows) {
      nlohmann::json row = nlohmann::json::array();
      for (auto& [c, w] : r) row.push_back({c, w});
      in["rows"].push_back(row);
    }
    auto ref = python_reference("tests/explore/scripts/spherical_kmeans.py", dir, in);
    MESSAGE("seed " << seed << ", k " << k << ": objective " << mine.objective << " (numpy " << ref["objective"].get<double>()
                    << ")");
    CHECK(std::abs(mine.objective - ref["objective"].get<double>()) < 1e-9);
    CHECK(ref["assignment"].get<std::vector<std::uint32_t>>() == mine.assignment);
  }
}

TEST_CASE("topic groups recover invented topics (adjusted Rand index by scikit-learn) deterministically per seed") {
  auto corpus = labelled_corpus();
  TempDir dir;
  auto reader = open_built(dir, "ari.sqlite", corpus.docs, kPlainWords);
  ThemeOptions o;  // k suggested by silhouette
  o.max_k = 8;
  auto res = find_themes(*reader, o);
  REQUIRE_MESSAGE(res.ok(), res.status().to_string());
  CHECK(res->k_suggested);
  CHECK(res->silhouettes.size() == 7);
  MESSAGE("suggested k = " << res->k);
  CHECK(res->k == 4);
  REQUIRE(res->docs.size() == corpus.docs.size());
  std::vector<int> labels;
  for (DocId d : res->docs) labels.push_back(corpus.labels[d - 1]);
  nlohmann::json in{{"labels", labels}, {"groups", res->group}};
  auto ref = python_reference("tests/explore/scripts/spherical_kmeans.py", dir, in);
  double ari = ref["ari"].get<double>();
  MESSAGE("adjusted Rand index (sklearn.metrics.adjusted_rand_score): " << ari);
  CHECK(ari >= 0.9);
  std::size_t total = 0;
  for (auto& t : res->themes) {
    total += t.size;
    CHECK(t.terms.size() == o.top_terms);
    CHECK(t.central.size() == o.top_documents);
    for (std::size_t i = 1; i < t.central.size(); ++i) CHECK(t.central[i].similarity <= t.central[i - 1].similarity);
  }
  CHECK(total == res->documents);
  auto again = find_themes(*reader, o);
  REQUIRE(again.ok());
  CHECK(again->group == res->group);
  CHECK(again->objective == res->objective);
  o.k = 1;
  CHECK(find_themes(*reader, o).status().code() == Code::kInvalidArgument);
}

TEST_CASE("theme terms are shown as the words the group's documents use, not as stems") {
  // English stemming: "generators"/"generator" -> "generat", "storms" -> "storm".
  std::vector<std::pair<std::string, std::string>> docs;
  for (int i = 0; i < 8; ++i) {
    docs.push_back({"", "the generators failed and the generator house flooded; generators again " +
                            std::to_string(i)});
    docs.push_back({"", "puffins nesting on the puffin bank, puffins everywhere " + std::to_string(i)});
  }
  TempDir dir;
  auto reader = open_built(dir, "words.sqlite", docs, AnalyzerOptions{});  // english, stemming
  ThemeOptions o;
  o.k = 2;
  o.min_df = 2;
  auto res = find_themes(*reader, o);
  REQUIRE_MESSAGE(res.ok(), res.status().to_string());
  auto analyzer = Analyzer::create(AnalyzerOptions{});
  REQUIRE(analyzer.ok());
  bool saw_generat = false;
  for (auto& t : res->themes)
    for (auto& w : t.terms) {
      CAPTURE(w.term);
      // The word analyzes back to the term, and is the most frequent form.
      auto a = (*analyzer)->analyze(w.word);
      REQUIRE(a.tokens.size() == 1);
      CHECK(a.tokens[0].term == w.term);
      if (w.term == "generat") {
        saw_generat = true;
        CHECK(w.word == "generators");  // 2 of 3 per document
      }
      if (w.term == "puffin") CHECK(w.word == "puffins");
    }
  CHECK(saw_generat);
}
