// Retrieval quality with default settings on three public collections
// (tests/data/<name>, provenance in each SOURCE.md). Floors are the figures
// first measured with lode 0.1.0 (docs/evaluation.md, title weight 0.5) minus
// 0.01, so a change that lowers quality fails here.
#include "core/util.h"
#include "lode/eval.h"
#include "lode/indexer.h"

using namespace lode;
using namespace lode::test;

namespace {

struct Expected {
  const char* name;
  std::size_t docs, judged;
  double map, ndcg10, p10;  // first measured (docs/evaluation.md)
};

void check_collection(const Expected& e) {
  TempDir dir;
  std::string index = dir.str("c.sqlite"), folder = std::string(LODE_TEST_DATA "/") + e.name;
  {
    auto w = IndexWriter::open(index, IndexSettings{});
    REQUIRE(w.ok());
    IndexRunOptions opts;
    opts.crawl.include = {"docs.jsonl"};
    auto rep = index_paths(**w, {folder}, opts);
    REQUIRE_MESSAGE(rep.ok(), rep.status().to_string());
    CHECK(rep->documents == e.docs);
  }
  auto queries = read_queries(folder + "/queries.tsv");
  REQUIRE(queries.ok());
  auto qrels = read_qrels(folder + "/qrels.txt");
  REQUIRE(qrels.ok());
  auto reader = IndexReader::open(index);
  REQUIRE(reader.ok());
  auto searcher = Searcher::create(**reader);
  REQUIRE(searcher.ok());
  SearchOptions defaults;
  defaults.reading = QueryReading::kPlain;  // judged queries are read as written (the TREC convention)
  auto run = run_queries(**searcher, *queries, defaults);
  REQUIRE_MESSAGE(run.ok(), run.status().to_string());
  Evaluation ev = evaluate(*run, *qrels);
  CHECK(ev.per_query.size() == e.judged);
  MESSAGE(std::string(e.name) << ": MAP " << ev.mean.ap << ", nDCG@10 " << ev.mean.ndcg10 << ", P@10 " << ev.mean.p10);
  CHECK(ev.mean.ap >= e.map - 0.01);
  CHECK(ev.mean.ndcg10 >= e.ndcg10 - 0.01);
  CHECK(ev.mean.p10 >= e.p10 - 0.01);
}

}  // namespace

TEST_CASE("quality floor: Cranfield 1400 / defaults") { check_collection({"cranfield", 1400, 225, 0.4324, 0.5340, 0.3160}); }
TEST_CASE("quality floor: MED / defaults") { check_collection({"med", 1033, 30, 0.5279, 0.6907, 0.6467}); }
TEST_CASE("quality floor: ADI / defaults") { check_collection({"adi", 82, 35, 0.4313, 0.5161, 0.2257}); }
