// Key terms: centroid weights, fields merged, surface forms counted.
#include <cmath>

#include "fixture.h"
#include "lode/keyterms.h"

using namespace lode;
using namespace lode::test;

namespace {
// Invented lighthouse notes; English stemming makes "lighthouses" and
// "lighthouse" one stem (Snowball english, as libstemmer ships it).
const std::vector<std::pair<std::string, std::string>> kDocs = {
    {"Lighthouses of the north", "The lighthouses stood on rocks. Lighthouses need keepers; one lighthouse had none."},
    {"Kelp survey", "Kelp forests grew back after the storm. The kelp was counted by divers."},
    {"Storm log", "A storm broke the quay. Another storm followed in winter."},
    {"Keepers", "Keepers kept the lamp lit and logged every storm."},
};
}  // namespace

TEST_CASE("key terms of a document: heaviest stems with their most frequent surface form and weights summed over fields") {
  TempDir dir;
  auto reader = open_built(dir, "k.sqlite", kDocs);
  KeyTermOptions o;
  auto res = key_terms_of_document(*reader, 1, o);
  REQUIRE_MESSAGE(res.ok(), res.status().to_string());
  REQUIRE(!res->terms.empty());
  const KeyTerm& top = res->terms[0];
  CHECK(top.term == "lighthous");
  CHECK(top.surface == "lighthouses");  // 3 times "lighthouses" (1 title + 2 body), once "lighthouse"
  CHECK(top.occurrences == 4);
  CHECK(top.df == 1);
  for (std::size_t i = 1; i < res->terms.size(); ++i) CHECK(res->terms[i].weight <= res->terms[i - 1].weight);

  // The weight is the title dimension plus the body dimension of the vector.
  auto scope = reader->begin();
  REQUIRE(scope.ok());
  VectorSource src(*reader, o.vectors);
  auto v = src.document(1);
  REQUIRE(v.ok());
  double sum = 0;
  int dims = 0;
  for (auto& e : *v)
    if (src.term(e.term).value()->term == "lighthous") sum += e.weight, ++dims;
  CHECK(dims == 2);
  CHECK(std::abs(sum - top.weight) < 1e-12);
}

TEST_CASE("key terms of search hits are the heaviest terms of their centroid") {
  TempDir dir;
  auto reader = open_built(dir, "q.sqlite", kDocs);
  KeyTermOptions o;
  o.top = 100;
  auto res = key_terms_of_query(*reader, "storm", SearchOptions{}, o);
  REQUIRE_MESSAGE(res.ok(), res.status().to_string());
  CHECK(res->documents.size() == 3);  // docs 2, 3, 4 mention a storm
  {
    // Centroid by hand: mean over the three documents of each stem's weights.
    auto scope = reader->begin();
    REQUIRE(scope.ok());
    VectorSource src(*reader, o.vectors);
    std::map<std::string, double> expected;
    for (DocId d : res->documents) {
      SparseVector v = src.document(d).value();
      for (auto& e : v) expected[src.term(e.term).value()->term] += e.weight / 3.0;
    }
    REQUIRE(res->terms.size() == expected.size());
    for (auto& k : res->terms) CHECK(std::abs(k.weight - expected[k.term]) < 1e-12);
  }
  // A query matching nothing gives NotFound.
  CHECK(key_terms_of_query(*reader, "zeppelin", SearchOptions{}, o).status().code() == Code::kNotFound);
}
