// RM3 pseudo-relevance feedback (FeedbackOptions in lode/ranking.h) on an
// invented corpus, checked against the method's definition computed here by
// brute force from the documents' words (Lavrenko & Croft 2001; Abdul-Jaleel
// et al. 2004): P(w|R) = sum_d P(d) tf(w,d)/|d| over the top documents,
// P(d) = first-pass score / sum of scores, top words renormalised, mixed as
// lambda * qtf + (1 - lambda) * |q| * P(w|R).
#include <algorithm>
#include <cmath>
#include <set>
#include <sstream>

#include "core/util.h"
#include "lode/eval.h"

using namespace lode;
using namespace lode::test;

namespace {

const std::vector<std::string> kDocs = {
    "storm surge flooded the north quay and the keeper logged the storm",
    "the storm broke the lamp glass and the keeper replaced the lamp",
    "gale warning from the mainland the keeper raised the storm cone",
    "kelp harvest on the south skerry after a calm week",
    "seal pups on the skerry counted by the keeper at low tide",
    "the lamp glass was cleaned and the paraffin store refilled",
    "a surge of spring tide covered the slipway and the quay",
    "gale and surge damage to the slipway was repaired in march",
};

std::vector<std::string> words(const std::string& s) {
  std::istringstream in(s);
  std::vector<std::string> out;
  for (std::string w; in >> w;) out.push_back(w);
  return out;
}

struct Fixture {
  TempDir dir;
  std::unique_ptr<IndexReader> reader;
  std::unique_ptr<Searcher> searcher;
  Fixture() {
    std::vector<std::pair<std::string, std::string>> docs;
    for (auto& d : kDocs) docs.push_back({"", d});
    build_index(dir.str("fb.sqlite"), docs, AnalyzerOptions{"none", false});
    reader = std::move(IndexReader::open(dir.str("fb.sqlite")).value());
    searcher = std::move(Searcher::create(*reader).value());
  }
};

SearchOptions with_feedback(std::size_t docs, std::size_t terms, double lambda) {
  SearchOptions o;
  o.snippets = false;
  o.top = 100;
  o.feedback = {docs, terms, lambda};
  return o;
}

}  // namespace

TEST_CASE("RM3: query weights equal the relevance-model mix computed from the documents' words") {
  Fixture f;
  const std::string query = "storm keeper";
  SearchOptions plain = with_feedback(0, 10, 0.5);
  auto first = f.searcher->search(query, plain);
  REQUIRE(first.ok());
  REQUIRE(first->hits.size() >= 3);
  // Relevance model over the top 3 by brute force.
  std::map<std::string, double> model;
  double total = 0;
  for (std::size_t i = 0; i < 3; ++i) total += first->hits[i].score;
  for (std::size_t i = 0; i < 3; ++i) {
    auto& h = first->hits[i];
    auto w = words(kDocs[std::stoul(h.external_id.substr(1)) - 1]);
    for (auto& x : w) model[x] += (h.score / total) / static_cast<double>(w.size());
  }
  std::vector<std::pair<std::string, double>> top(model.begin(), model.end());
  std::sort(top.begin(), top.end(),
            [](auto& a, auto& b) { return a.second != b.second ? a.second > b.second : a.first < b.first; });
  top.resize(5);
  double mass = 0;
  for (auto& [w, p] : top) mass += p;
  std::map<std::string, double> expected = {{"storm", 0.6}, {"keeper", 0.6}};  // lambda 0.6 * qtf 1
  for (auto& [w, p] : top) expected[w] += 0.4 * 2 * p / mass;               // |q| = 2

  auto fb = f.searcher->search(query, with_feedback(3, 5, 0.6));
  REQUIRE(fb.ok());
  std::set<std::string> seen;
  for (auto& h : fb->hits) {
    double sum = 0;
    for (auto& c : h.breakdown) {
      CAPTURE(c.term);
      REQUIRE(expected.count(c.term) == 1);
      CHECK(c.query_weight == doctest::Approx(expected[c.term]).epsilon(1e-12));
      sum += c.contribution;
      seen.insert(c.term);
    }
    CHECK(sum == doctest::Approx(h.score).epsilon(1e-12));  // breakdowns still sum to the score
  }
  CHECK(seen.size() > 2);  // expansion words took part
  // Feedback reaches documents without any query word (d7 shares "surge", "quay" with the top hits).
  bool plain_has_d7 = false, fb_has_d7 = false;
  for (auto& h : first->hits) plain_has_d7 |= h.external_id == "d7";
  for (auto& h : fb->hits) fb_has_d7 |= h.external_id == "d7";
  CHECK(!plain_has_d7);
  CHECK(fb_has_d7);
}

TEST_CASE("RM3: original weight 1 reproduces the first pass / constraints still apply / bad settings refused") {
  Fixture f;
  auto a = f.searcher->search("surge slipway", with_feedback(0, 10, 0.5));
  auto b = f.searcher->search("surge slipway", with_feedback(3, 10, 1.0));
  REQUIRE(a.ok());
  REQUIRE(b.ok());
  REQUIRE(a->hits.size() == b->hits.size());
  for (std::size_t i = 0; i < a->hits.size(); ++i) {
    CHECK(a->hits[i].external_id == b->hits[i].external_id);
    CHECK(a->hits[i].score == doctest::Approx(b->hits[i].score).epsilon(1e-12));
  }
  auto req = f.searcher->search("+lamp storm -paraffin", with_feedback(3, 10, 0.3));
  REQUIRE(req.ok());
  REQUIRE(!req->hits.empty());
  for (auto& h : req->hits) {
    CHECK((h.external_id == "d2"));  // the only document with lamp and without paraffin
  }
  SearchOptions tfidf = with_feedback(3, 10, 0.5);
  tfidf.model = Model::kTfIdf;
  auto bad = f.searcher->search("storm", tfidf);
  CHECK(bad.status().code() == Code::kInvalidArgument);
  auto bad_weight = f.searcher->search("storm", with_feedback(3, 10, 1.5));
  CHECK(bad_weight.status().code() == Code::kInvalidArgument);
  // A query that matches nothing has no feedback documents: no hits, no error.
  auto none = f.searcher->search("lighthousekeeping", with_feedback(3, 10, 0.5));
  REQUIRE(none.ok());
  CHECK(none->hits.empty());
}
