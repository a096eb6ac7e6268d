// Average precision and nDCG against scikit-learn (Debian python3-sklearn,
// run as /usr/bin/python3 by tests/scripts/sklearn_metrics.py) on random
// rankings and random graded judgments, to 1e-9. How the sklearn calls are
// set up to match the usual definitions (all relevant documents in the AP
// denominator, the ideal nDCG ranking from every judgment) is in the script.
#include <cmath>
#include <set>
#include <nlohmann/json.hpp>
#include <random>

#include "core/util.h"
#include "lode/eval.h"

using namespace lode;
using namespace lode::test;

namespace {

struct Case {
  std::vector<std::string> ranked;
  std::map<std::string, int> judged;
};

// A collection of `docs` documents, about a quarter judged relevant with
// grades 1..3 (some judged 0), ranked by a random permutation cut at `length`.
Case random_case(std::mt19937& rng, std::size_t docs, std::size_t length) {
  Case c;
  std::vector<std::string> all;
  for (std::size_t i = 0; i < docs; ++i) all.push_back("doc" + std::to_string(i));
  std::uniform_int_distribution<int> grade(0, 11);
  for (auto& d : all) {
    int g = grade(rng);
    if (g <= 3) c.judged[d] = g;  // 0 = judged not relevant
  }
  if (std::none_of(c.judged.begin(), c.judged.end(), [](auto& kv) { return kv.second > 0; })) c.judged[all[0]] = 2;
  std::shuffle(all.begin(), all.end(), rng);
  c.ranked.assign(all.begin(), all.begin() + static_cast<std::ptrdiff_t>(length));
  return c;
}

}  // namespace

TEST_CASE("AP and nDCG@k equal scikit-learn's on 200 random rankings (1e-9)") {
  std::mt19937 rng(4242);
  const std::vector<std::size_t> ks = {1, 5, 10, 20};
  std::vector<Case> cases;
  nlohmann::json input{{"cases", nlohmann::json::array()}};
  for (int i = 0; i < 200; ++i) {
    std::size_t docs = 20 + static_cast<std::size_t>(rng() % 60);
    // Every third case ranks the whole collection; the others stop early but never above the largest k.
    std::size_t length = i % 3 == 0 ? docs : 20 + static_cast<std::size_t>(rng() % (docs - 19));
    Case c = random_case(rng, docs, length);
    std::vector<int> grades, unretrieved;
    std::set<std::string> in_list(c.ranked.begin(), c.ranked.end());
    for (auto& d : c.ranked) grades.push_back(c.judged.count(d) ? c.judged[d] : 0);
    std::size_t relevant = 0;
    for (auto& [d, g] : c.judged) {
      relevant += g > 0;
      if (g > 0 && !in_list.count(d)) unretrieved.push_back(g);
    }
    input["cases"].push_back({{"grades", grades}, {"relevant_total", relevant}, {"unretrieved", unretrieved}, {"k", ks}});
    cases.push_back(std::move(c));
  }
  TempDir dir;
  write_file(dir.path() / "in.json", input.dump());
  int rc = 0;
  std::string out = run("/usr/bin/python3 " LODE_SOURCE_DIR "/tests/scripts/sklearn_metrics.py " + dir.str("in.json") +
                            " 2>&1",
                        &rc);
  REQUIRE_MESSAGE(rc == 0, "scikit-learn reference failed (install python3-sklearn): " << out);
  auto ref = nlohmann::json::parse(out);
  REQUIRE(ref.size() == cases.size());
  std::size_t nonzero_ap = 0;
  for (std::size_t i = 0; i < cases.size(); ++i) {
    CAPTURE(i);
    double ap = average_precision(cases[i].ranked, cases[i].judged);
    CHECK(std::abs(ap - ref[i]["ap"].get<double>()) < 1e-9);
    nonzero_ap += ap > 0;
    for (std::size_t k : ks) {
      CAPTURE(k);
      CHECK(std::abs(ndcg_at(cases[i].ranked, cases[i].judged, k) - ref[i]["ndcg"][std::to_string(k)].get<double>()) <
            1e-9);
    }
  }
  CHECK(nonzero_ap > 150);  // the comparison exercised real values, not zeros
}
