// Similar documents: exact cosine against scikit-learn, candidate search
// against brute force, the source excluded.
#include <cmath>
#include <nlohmann/json.hpp>

#include "corpus.h"
#include "fixture.h"
#include "lode/similar.h"

using namespace lode;
using namespace lode::test;

namespace {
double dict_cosine(const nlohmann::json& a, const nlohmann::json& b) {
  double s = 0;
  for (auto& [t, w] : a.items())
    if (b.contains(t)) s += w.get<double>() * b[t].get<double>();
  return s;
}
}  // namespace

TEST_CASE("similarities equal scikit-learn cosines (sublinear tf with smooth idf and l2) to 1e-9") {
  TempDir dir;
  // Outside reference: scikit-learn TfidfVectorizer via tests/scripts/sklearn_tfidf.py.
  auto ref = python_reference("tests/scripts/sklearn_tfidf.py", dir,
                              {{"docs", kHarbourNotes}, {"queries", std::vector<std::string>{"storm"}}});
  auto reader = open_built(dir, "s.sqlite", bodies(kHarbourNotes), kPlainWords);
  SimilarOptions o;
  o.vectors.tf = 'l';
  o.vectors.idf = 's';
  o.vectors.log_base = std::exp(1.0);
  o.vectors.field_weight = {0, 1};
  o.top = kHarbourNotes.size();
  o.shared_terms = 100;
  std::size_t checked = 0;
  for (DocId d = 1; d <= kHarbourNotes.size(); ++d) {
    CAPTURE(d);
    auto res = similar_to_document(*reader, d, o);
    REQUIRE_MESSAGE(res.ok(), res.status().to_string());
    for (std::size_t i = 0; i < res->hits.size(); ++i) {
      const SimilarHit& h = res->hits[i];
      CHECK(h.doc != d);  // the source is never its own neighbour
      if (i > 0) CHECK(h.similarity <= res->hits[i - 1].similarity);
      std::size_t other = std::stoul(h.external_id.substr(1)) - 1;
      double expected = dict_cosine(ref["weights"][d - 1], ref["weights"][other]);
      CHECK(std::abs(h.similarity - expected) < 1e-9);
      double shares = 0;  // all shared terms together make up the similarity
      for (auto& s : h.shared) shares += s.share;
      CHECK(std::abs(shares - h.similarity) < 1e-12);
      ++checked;
    }
  }
  CHECK(checked >= 30);
}

TEST_CASE("the candidate search finds the brute-force top 5 on a generated corpus") {
  std::mt19937_64 rng(7);
  auto common = invented_words("c", 300);
  std::vector<std::pair<std::string, std::string>> corpus;
  for (int t = 0; t < 6; ++t) {
    auto topic = invented_words(std::string(1, static_cast<char>('p' + t)), 60);
    for (int i = 0; i < 40; ++i) corpus.push_back({"", invented_text(rng, topic, common, 80, 0.4)});
  }
  TempDir dir;
  auto reader = open_built(dir, "g.sqlite", corpus, kPlainWords);
  SimilarOptions o;
  o.top = 5;
  std::vector<SparseVector> all;
  {
    auto scope = reader->begin();
    REQUIRE(scope.ok());
    VectorSource src(*reader, o.vectors);
    for (DocId d = 1; d <= corpus.size(); ++d) all.push_back(src.document(d).value());
  }
  std::size_t agree = 0, total = 0;
  for (DocId d = 1; d <= corpus.size(); d += 7) {
    std::vector<std::pair<double, DocId>> brute;
    for (DocId e = 1; e <= corpus.size(); ++e)
      if (e != d) brute.push_back({-cosine(all[d - 1], all[e - 1]), e});
    std::sort(brute.begin(), brute.end());
    auto res = similar_to_document(*reader, d, o);
    REQUIRE(res.ok());
    REQUIRE(res->hits.size() == 5);
    for (std::size_t i = 0; i < 5; ++i) {
      agree += res->hits[i].doc == brute[i].second;
      ++total;
      CHECK(std::abs(res->hits[i].similarity - cosine(all[d - 1], all[res->hits[i].doc - 1])) < 1e-12);
    }
  }
  MESSAGE("similar documents agreeing with brute force: " << agree << "/" << total);
  CHECK(agree >= total * 95 / 100);
}

TEST_CASE("a passage finds the documents that share its rare words and errors are named") {
  TempDir dir;
  auto reader = open_built(dir, "p.sqlite", bodies(kHarbourNotes));
  auto res = similar_to_text(*reader, "Seal pups on the skerry", SimilarOptions{});
  REQUIRE(res.ok());
  REQUIRE(res->hits.size() >= 2);
  CHECK(res->hits[0].external_id == "d7");  // seal, pup, skerry: all three
  CHECK(res->hits[1].external_id == "d3");  // seal, skerry
  CHECK(similar_to_text(*reader, "zzzz qqqq", SimilarOptions{}).status().code() == Code::kInvalidArgument);
  CHECK(similar_to_document(*reader, 999, SimilarOptions{}).status().code() == Code::kNotFound);
  CHECK(resolve_document(*reader, "d4").value() == 4);
  CHECK(resolve_document(*reader, "#5").value() == 5);
  CHECK(resolve_document(*reader, "nope").status().message().find("nope") != std::string::npos);
  SimilarOptions bad;
  bad.candidates = 2;
  CHECK(similar_to_document(*reader, 1, bad).status().code() == Code::kInvalidArgument);
}
