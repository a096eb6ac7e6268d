// Document vectors: weights are ranking.h's smart_tf x smart_idf, l2-normalised.
#include <cmath>

#include "fixture.h"
#include "lode/vectors.h"

using namespace lode;
using namespace lode::test;

TEST_CASE("a document vector is its ltc weights at unit length checked by hand") {
  // Invented: 3 documents, body only; language none keeps words as written.
  TempDir dir;
  auto reader = open_built(dir, "v.sqlite", bodies({"gull gull tern", "tern puffin", "puffin puffin puffin"}),
                           kPlainWords);
  auto scope = reader->begin();
  REQUIRE(scope.ok());
  VectorSource src(*reader, VectorOptions{});
  auto v = src.document(1);
  REQUIRE(v.ok());
  REQUIRE(v->size() == 2);
  // Hand computation (base 10): gull tf 2, df 1: (1 + log 2) * log(3/1);
  // tern tf 1, df 2: 1 * log(3/2); then divide by the Euclidean length.
  double g = (1 + std::log10(2.0)) * std::log10(3.0), t = std::log10(1.5);
  double len = std::sqrt(g * g + t * t);
  std::map<std::string, double> got;
  for (auto& e : *v) got[src.term(e.term).value()->term] = e.weight;
  CHECK(std::abs(got["gull"] - g / len) < 1e-12);
  CHECK(std::abs(got["tern"] - t / len) < 1e-12);
  CHECK(std::abs(cosine(*v, *v) - 1.0) < 1e-12);
  CHECK(src.document(99).status().code() == Code::kNotFound);
  CHECK(live_documents(*reader) == std::vector<DocId>{1, 2, 3});
}

TEST_CASE("bad vector options are refused with the option named") {
  VectorOptions o;
  o.tf = 'x';
  CHECK(o.check().message().find("tf letter 'x'") != std::string::npos);
  o = VectorOptions{};
  o.field_weight = {0, 0};
  CHECK(!o.check().ok());
  o = VectorOptions{};
  o.log_base = 1;
  CHECK(!o.check().ok());
}
