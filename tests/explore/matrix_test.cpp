// Matrix export: read back with scipy.io.mmread and compared with
// scikit-learn's TfidfVectorizer (Debian python3-sklearn, python3-scipy) for
// matched settings; the count/length x log10(N/df) variant by hand.
#include <cmath>
#include <nlohmann/json.hpp>
#include <sstream>

#include "fixture.h"
#include "lode/matrix.h"

using namespace lode;
using namespace lode::test;

namespace {

struct Exported {
  TempDir dir;
  MatrixFiles files;
  MatrixSummary summary;
};

void export_corpus(Exported& e, const std::vector<std::string>& docs, const MatrixOptions& o) {
  auto reader = open_built(e.dir, "m.sqlite", bodies(docs), kPlainWords);
  e.files = {e.dir.str("out.mtx"), e.dir.str("out.terms"), e.dir.str("out.docs")};
  auto r = export_matrix(*reader, o, e.files);
  REQUIRE_MESSAGE(r.ok(), r.status().to_string());
  e.summary = *r;
}

std::vector<std::string> lines(const std::string& path) {
  std::vector<std::string> out;
  std::istringstream in(read_text(path));
  for (std::string l; std::getline(in, l);) out.push_back(l);
  return out;
}

// Compares lode's matrix (via scipy.io.mmread) with TfidfVectorizer(**settings).
void check_against_sklearn(const MatrixOptions& o, const nlohmann::json& settings) {
  Exported e;
  export_corpus(e, kHarbourNotes, o);
  auto ref = python_reference("tests/explore/scripts/sklearn_matrix.py", e.dir,
                              {{"docs", kHarbourNotes}, {"mtx", e.files.matrix}, {"settings", settings}});
  auto vocab = lines(e.files.vocabulary);
  // Same vocabulary in the same (sorted) order, same documents in order.
  CHECK(vocab == ref["sklearn"]["vocabulary"].get<std::vector<std::string>>());
  CHECK(lines(e.files.documents).size() == kHarbourNotes.size());
  CHECK(lines(e.files.documents)[0] == "d1");
  REQUIRE(ref["shape"][0].get<std::size_t>() == kHarbourNotes.size());
  REQUIRE(ref["shape"][1].get<std::size_t>() == vocab.size());
  std::size_t compared = 0;
  for (std::size_t i = 0; i < kHarbourNotes.size(); ++i)
    for (std::size_t j = 0; j < vocab.size(); ++j) {
      CAPTURE(i);
      CAPTURE(vocab[j]);
      CHECK(std::abs(ref["lode"][i][j].get<double>() - ref["sklearn"]["rows"][i][j].get<double>()) < 1e-9);
      compared += ref["sklearn"]["rows"][i][j].get<double>() != 0;
    }
  CHECK(compared == e.summary.entries);
}

}  // namespace

TEST_CASE("matrix equals TfidfVectorizer defaults (count tf with smooth idf and l2) read back with mmread") {
  MatrixOptions o;
  o.tf = 'n';
  o.idf = 's';
  o.log_base = std::exp(1.0);
  check_against_sklearn(o, {{"smooth_idf", true}, {"norm", "l2"}});
}

TEST_CASE("matrix equals TfidfVectorizer with sublinear tf and min_df / max_df filters") {
  MatrixOptions o;
  o.tf = 'l';
  o.idf = 's';
  o.log_base = std::exp(1.0);
  o.min_df = 2;
  o.max_df = 0.5;
  check_against_sklearn(o, {{"sublinear_tf", true}, {"min_df", 2}, {"max_df", 0.5}});
}

TEST_CASE("count/length x log10(N/df) without normalisation by hand in the Matrix Market layout") {
  // Invented corpus, N = 3:
  //   d1 "gull gull tern"  length 3
  //   d2 "tern puffin"     length 2
  //   d3 "gull gull gull gull"  length 4
  // df: gull 2, puffin 1, tern 2. Columns sorted: gull, puffin, tern.
  Exported e;
  MatrixOptions o;
  o.tf = 'r';
  o.idf = 't';
  o.l2 = false;
  export_corpus(e, {"gull gull tern", "tern puffin", "gull gull gull gull"}, o);
  CHECK(lines(e.files.vocabulary) == std::vector<std::string>{"gull", "puffin", "tern"});
  CHECK(lines(e.files.documents) == std::vector<std::string>{"d1", "d2", "d3"});
  const double l32 = std::log10(3.0 / 2.0), l31 = std::log10(3.0);
  std::map<std::pair<int, int>, double> expected = {
      {{1, 1}, 2.0 / 3 * l32},  // d1 gull: 2/3 x log10(3/2)
      {{1, 3}, 1.0 / 3 * l32},  // d1 tern: 1/3 x log10(3/2)
      {{2, 2}, 1.0 / 2 * l31},  // d2 puffin: 1/2 x log10(3)
      {{2, 3}, 1.0 / 2 * l32},  // d2 tern: 1/2 x log10(3/2)
      {{3, 1}, 4.0 / 4 * l32},  // d3 gull: 4/4 x log10(3/2)
  };
  auto l = lines(e.files.matrix);
  REQUIRE(l.size() >= 4);
  // NIST Matrix Market: banner, comments, "rows cols entries", then 1-based "i j value".
  CHECK(l[0] == "%%MatrixMarket matrix coordinate real general");
  std::size_t at = 1;
  while (at < l.size() && l[at][0] == '%') ++at;
  CHECK(l[at] == "3 3 5");
  std::map<std::pair<int, int>, double> got;
  for (++at; at < l.size(); ++at) {
    std::istringstream in(l[at]);
    int i = 0, j = 0;
    double v = 0;
    in >> i >> j >> v;
    got[{i, j}] = v;
  }
  REQUIRE(got.size() == expected.size());
  for (auto& [ij, v] : expected) {
    CAPTURE(ij.first);
    CAPTURE(ij.second);
    CHECK(std::abs(got[ij] - v) < 1e-15);
  }
}

TEST_CASE("matrix filters keep the terms of highest df and errors name the option or file") {
  Exported e;
  MatrixOptions o;
  o.max_terms = 2;
  o.idf = 'n';
  export_corpus(e, {"aa bb cc", "aa bb", "aa dd"}, o);
  CHECK(lines(e.files.vocabulary) == std::vector<std::string>{"aa", "bb"});  // df 3 and 2
  CHECK(e.summary.entries == 5);
  MatrixOptions bad;
  bad.max_df = 0;
  CHECK(bad.check().message().find("max df") != std::string::npos);
  bad = MatrixOptions{};
  bad.fields = {false, false};
  CHECK(!bad.check().ok());
  auto reader = IndexReader::open(e.dir.str("m.sqlite"));
  REQUIRE(reader.ok());
  MatrixFiles nowhere{"/nonexistent-dir/x.mtx", "/nonexistent-dir/x.terms", "/nonexistent-dir/x.docs"};
  auto r = export_matrix(**reader, MatrixOptions{}, nowhere);
  CHECK(r.status().code() == Code::kIOError);
  CHECK(r.status().message().find("/nonexistent-dir/x.mtx") != std::string::npos);
}
