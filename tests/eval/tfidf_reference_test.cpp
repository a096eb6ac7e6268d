// lode's TF-IDF against a one-field lnc.ltc computed outside lode: the
// independent script tests/scripts/lnc_ltc.py (SMART weights as in Manning,
// Raghavan & Schuetze 2008, section 6.4) ranks the public collections from raw
// word counts that `lode matrix` exports (title and text added into one
// column, so the analysis is the same and the weighting is the script's own).
// The default TF-IDF (one joint vector over title and body) with title weight
// 1 must give the same scores; with the default field weights it must not
// fall below that reference's MAP (docs/evaluation.md).
#include <cmath>
#include <nlohmann/json.hpp>

#include "core/util.h"
#include "lode/eval.h"

using namespace lode;
using namespace lode::test;

namespace {

const std::string kLode = LODE_BINARY;

Run reference_run(TempDir& dir, const std::string& folder) {
  int rc = -1;
  const std::string docs = dir.str("docs.sqlite"), queries = dir.str("queries.sqlite");
  run(kLode + " --index " + docs + " index -q --include docs.jsonl " + folder + " 2>&1", &rc);
  REQUIRE(rc == 0);
  // The queries as one-field records, so the index's analyzer reads them.
  auto lines = read_queries(folder + "/queries.tsv");
  REQUIRE(lines.ok());
  std::string jsonl;
  for (const QueryLine& q : *lines) jsonl += nlohmann::json{{"id", q.id}, {"title", ""}, {"text", q.text}}.dump() + "\n";
  std::filesystem::create_directories(dir.path() / "q");
  write_file(dir.path() / "q" / "queries.jsonl", jsonl);
  run(kLode + " --index " + queries + " index -q " + dir.str("q") + " 2>&1", &rc);
  REQUIRE(rc == 0);
  run(kLode + " --index " + docs + " matrix -q --fields both --tf count --idf none --norm none --out " +
          dir.str("d") + " 2>&1",
      &rc);
  REQUIRE(rc == 0);
  run(kLode + " --index " + queries + " matrix -q --fields body --tf count --idf none --norm none --out " +
          dir.str("qm") + " 2>&1",
      &rc);
  REQUIRE(rc == 0);
  std::string out = run("/usr/bin/python3 " LODE_SOURCE_DIR "/tests/scripts/lnc_ltc.py " + dir.str("d.mtx") + " " +
                            dir.str("d.terms") + " " + dir.str("d.docs") + " " + dir.str("qm.mtx") + " " +
                            dir.str("qm.terms") + " " + dir.str("qm.docs") + " 1000 2>&1",
                        &rc);
  REQUIRE_MESSAGE(rc == 0, out);
  auto ref = parse_run(out, "lnc_ltc.py");
  REQUIRE_MESSAGE(ref.ok(), ref.status().to_string());
  return *ref;
}

void check_collection(const std::string& name) {
  CAPTURE(name);
  TempDir dir;
  const std::string folder = std::string(LODE_TEST_DATA "/") + name;
  Run ref = reference_run(dir, folder);
  auto reader = IndexReader::open(dir.str("docs.sqlite"));
  REQUIRE(reader.ok());
  auto searcher = Searcher::create(**reader);
  REQUIRE(searcher.ok());
  auto queries = read_queries(folder + "/queries.tsv");
  auto qrels = read_qrels(folder + "/qrels.txt");
  REQUIRE(queries.ok());
  REQUIRE(qrels.ok());
  SearchOptions one;
  one.model = Model::kTfIdf;  // the default weighting lnc.ltc and fields joint
  one.reading = QueryReading::kPlain;
  one.field_weight = {1.0, 1.0};
  auto run1 = run_queries(**searcher, *queries, one);
  REQUIRE(run1.ok());
  std::size_t compared = 0;
  for (auto& [qid, entries] : ref) {
    CAPTURE(qid);
    const auto& mine = (*run1)[qid];
    REQUIRE(mine.size() == entries.size());
    for (std::size_t i = 0; i < entries.size(); ++i) {
      // The score at every rank agrees (documents may differ only where two
      // scores are within rounding of each other: the sums run in other orders).
      CHECK(std::abs(mine[i].score - entries[i].score) < 1e-12);
      compared += mine[i].docid == entries[i].docid;
    }
  }
  CHECK(compared > 1000);  // same documents at the same ranks, nearly everywhere
  const double ref_map = evaluate(ref, *qrels).mean.ap;
  const double one_map = evaluate(*run1, *qrels).mean.ap;
  CHECK(std::abs(one_map - ref_map) < 1e-9);
  SearchOptions dflt;
  dflt.model = Model::kTfIdf;
  dflt.reading = QueryReading::kPlain;
  auto run2 = run_queries(**searcher, *queries, dflt);
  REQUIRE(run2.ok());
  const double default_map = evaluate(*run2, *qrels).mean.ap;
  MESSAGE(name << ": reference lnc.ltc MAP " << ref_map << ", lode one-field " << one_map << ", lode default TF-IDF "
               << default_map);
  CHECK(default_map >= ref_map - 1e-9);
}

}  // namespace

TEST_CASE("TF-IDF against an outside one-field lnc.ltc: Cranfield") { check_collection("cranfield"); }
TEST_CASE("TF-IDF against an outside one-field lnc.ltc: ADI") { check_collection("adi"); }
TEST_CASE("TF-IDF against an outside one-field lnc.ltc: MED") { check_collection("med"); }
