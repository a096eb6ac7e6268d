// Near-duplicates: recall of MinHash + LSH against brute force on a corpus
// with planted duplicates; every reported pair verified.
#include <set>

#include "fixture.h"
#include "corpus.h"
#include "lode/twins.h"

using namespace lode;
using namespace lode::test;

namespace {

struct Planted {
  std::vector<std::pair<std::string, std::string>> docs;
};

// 300 originals of 60-150 words; 60 of them copied once or twice with 2-25%
// of the words replaced (so some copies fall below the threshold).
Planted planted_corpus() {
  std::mt19937_64 rng(11);
  auto common = invented_words("c", 2000);
  auto topic = invented_words("t", 400);
  Planted p;
  for (int i = 0; i < 300; ++i)
    p.docs.push_back({"", invented_text(rng, topic, common, 60 + rng() % 90, 0.3)});
  for (int i = 0; i < 60; ++i) {
    std::size_t src = rng() % 300;
    int copies = 1 + static_cast<int>(rng() % 2);
    for (int c = 0; c < copies; ++c)
      p.docs.push_back({"", edited_copy(rng, p.docs[src].second, common, 0.02 + static_cast<double>(rng() % 24) / 100)});
  }
  return p;
}

std::set<std::pair<DocId, DocId>> brute_force(IndexReader& reader, const VectorOptions& vo, double threshold) {
  auto scope = reader.begin();
  REQUIRE(scope.ok());
  VectorSource src(reader, vo);
  std::vector<SparseVector> v;
  auto docs = live_documents(reader);
  for (DocId d : docs) v.push_back(src.document(d).value());
  std::set<std::pair<DocId, DocId>> out;
  for (std::size_t i = 0; i < v.size(); ++i)
    for (std::size_t j = i + 1; j < v.size(); ++j)
      if (cosine(v[i], v[j]) >= threshold) out.insert({docs[i], docs[j]});
  return out;
}

void check_recall(IndexReader& reader, const TwinOptions& o, const char* label) {
  auto exact = brute_force(reader, o.vectors, o.threshold);
  auto res = find_twins(reader, o);
  REQUIRE_MESSAGE(res.ok(), res.status().to_string());
  std::set<std::pair<DocId, DocId>> found;
  for (auto& g : res->groups)
    for (auto& p : g.pairs) {
      CHECK(p.similarity >= o.threshold - 1e-12);  // verified by exact cosine
      CHECK(exact.count({p.a, p.b}) == 1);
      found.insert({p.a, p.b});
    }
  std::size_t hit = 0;
  for (auto& pr : exact) hit += found.count(pr);
  double recall = static_cast<double>(hit) / static_cast<double>(exact.size());
  std::size_t n = res->documents, all_pairs = n * (n - 1) / 2;
  MESSAGE(std::string(label) << ": " << exact.size() << " pairs at cosine >= " << o.threshold << " by brute force, recall "
                << recall << ", " << res->candidate_pairs << " candidate pairs of " << all_pairs);
  CHECK(exact.size() >= 40);  // the planted copies are there to be found
  CHECK(recall >= 0.95);
  CHECK(res->candidate_pairs * 20 < all_pairs);  // far fewer comparisons than all pairs
}

}  // namespace

TEST_CASE("twins: recall >= 0.95 of the brute-force pairs above the threshold (term shingles)") {
  TempDir dir;
  auto reader = open_built(dir, "t.sqlite", planted_corpus().docs, kPlainWords);
  TwinOptions o;
  o.threshold = 0.8;
  check_recall(*reader, o, "shingle 1");
}

TEST_CASE("twins: recall >= 0.95 with 2-word shingles of the stored text") {
  TempDir dir;
  auto reader = open_built(dir, "t2.sqlite", planted_corpus().docs, kPlainWords);
  TwinOptions o;
  o.threshold = 0.8;
  o.shingle = 2;
  o.bands = 50;
  o.rows = 3;
  check_recall(*reader, o, "shingle 2");
}

TEST_CASE("twins: groups join chains of pairs and repeat for a seed and bad options are named") {
  std::vector<std::pair<std::string, std::string>> docs = {
      {"", "alpha beta gamma delta epsilon zeta eta theta iota kappa"},
      {"", "alpha beta gamma delta epsilon zeta eta theta iota kappa"},
      {"", "alpha beta gamma delta epsilon zeta eta theta iota lambda"},
      {"", "mu nu xi omicron pi rho sigma tau upsilon phi"},
  };
  TempDir dir;
  auto reader = open_built(dir, "g.sqlite", docs, kPlainWords);
  TwinOptions o;
  o.threshold = 0.3;  // d3 differs from d1 in its rarest word: cosine about 0.41 (ltc)
  auto a = find_twins(*reader, o);
  REQUIRE(a.ok());
  REQUIRE(a->groups.size() == 1);
  CHECK(a->groups[0].docs == std::vector<DocId>{1, 2, 3});
  CHECK(a->groups[0].external_ids == std::vector<std::string>{"d1", "d2", "d3"});
  CHECK(std::abs(a->groups[0].max_similarity - 1.0) < 1e-12);
  auto b = find_twins(*reader, o);
  REQUIRE(b.ok());
  CHECK(b->candidate_pairs == a->candidate_pairs);
  o.threshold = 0;
  CHECK(find_twins(*reader, o).status().message().find("threshold") != std::string::npos);
}
