// TF-IDF weights and cosine scores against scikit-learn's TfidfVectorizer
// (Debian package python3-sklearn, run as /usr/bin/python3 by
// tests/scripts/sklearn_tfidf.py) with matched settings: sublinear tf
// (1 + ln tf), smooth idf (ln((1+N)/(1+df)) + 1), l2 normalisation.
// In lode's SMART notation that is "lsc.lsc" with log base e.
#include <cmath>
#include <nlohmann/json.hpp>

#include "util.h"

using namespace lode;
using namespace lode::test;

TEST_CASE("TF-IDF equals scikit-learn TfidfVectorizer (sublinear tf, smooth idf, l2) to 1e-9") {
  // An invented corpus: lowercase words of 2+ letters, so sklearn's default
  // token pattern and lode's segmentation agree token for token.
  std::vector<std::string> docs = {
      "the keeper logged the storm and the storm surge at the north quay",
      "kelp beds recovered after the storm winter",
      "seals hauled out on the north skerry at low tide",
      "the lamp burned paraffin until the generator was installed",
      "generator generator generator maintenance log for the winter",
      "tide tables tide gauge readings and one storm warning",
      "seal pups counted on the skerry by the keeper",
      "one winter of gales kelp washed ashore on the quay",
  };
  std::vector<std::string> queries = {"storm surge", "kelp winter storm", "seal skerry tide", "generator log",
                                      "the keeper"};
  TempDir dir;
  nlohmann::json input{{"docs", docs}, {"queries", queries}};
  write_file(dir.path() / "in.json", input.dump());
  int rc = 0;
  std::string out = run("/usr/bin/python3 " LODE_SOURCE_DIR "/tests/scripts/sklearn_tfidf.py " +
                            dir.str("in.json") + " 2>&1",
                        &rc);
  REQUIRE_MESSAGE(rc == 0, "scikit-learn reference failed (install python3-sklearn): " << out);
  auto ref = nlohmann::json::parse(out);

  std::vector<std::pair<std::string, std::string>> corpus;
  for (auto& d : docs) corpus.push_back({"", d});
  std::string path = dir.str("sk.sqlite");
  build_index(path, corpus, AnalyzerOptions{"none", false});
  auto reader = IndexReader::open(path);
  REQUIRE(reader.ok());
  SearchOptions o;
  o.model = Model::kTfIdf;
  o.smart = SmartWeighting::parse("lsc.lsc").value();
  o.smart.log_base = std::exp(1.0);
  o.field_weight = {0.0, 1.0};
  o.top = 100;
  o.snippets = false;
  auto searcher = Searcher::create(**reader);
  REQUIRE(searcher.ok());

  std::size_t checked_scores = 0, checked_weights = 0;
  for (std::size_t qi = 0; qi < queries.size(); ++qi) {
    CAPTURE(queries[qi]);
    auto res = (*searcher)->search(queries[qi], o);
    REQUIRE(res.ok());
    std::map<std::string, const Hit*> by_id;
    for (auto& h : res->hits) by_id[h.external_id] = &h;
    for (std::size_t di = 0; di < docs.size(); ++di) {
      double expected = ref["scores"][qi][di].get<double>();
      std::string id = "d" + std::to_string(di + 1);
      CAPTURE(id);
      if (expected == 0) {
        CHECK(by_id.count(id) == 0);
        continue;
      }
      REQUIRE(by_id.count(id) == 1);
      CHECK(std::abs(by_id[id]->score - expected) < 1e-9);
      ++checked_scores;
      // Each breakdown entry's document weight is sklearn's matrix entry.
      for (auto& c : by_id[id]->breakdown) {
        double w = ref["weights"][di][c.term].get<double>();
        CHECK(std::abs(c.tf_part - w) < 1e-9);
        CHECK(std::abs(c.idf - ref["idf"][c.term].get<double>()) < 1e-9);
        ++checked_weights;
      }
    }
  }
  CHECK(checked_scores >= 15);
  CHECK(checked_weights >= 20);
}
