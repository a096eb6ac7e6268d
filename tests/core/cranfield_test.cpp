// Retrieval quality on the Cranfield 1400 collection (tests/data/cranfield,
// provenance in its SOURCE.md): BM25 with default settings, scored with lode's
// metrics. Floors are the figures first measured with this code minus 0.01
// (MAP 0.4309, nDCG@10 0.5236 on 2026-12-02); a plain BM25 with Snowball
// stemming and stopwords is commonly reported near MAP 0.43 here.
#include "lode/eval.h"
#include "lode/indexer.h"
#include "util.h"

using namespace lode;
using namespace lode::test;

TEST_CASE("Cranfield: BM25 MAP and nDCG@10 over all 225 queries stay at their measured level") {
  TempDir dir;
  std::string index = dir.str("cran.sqlite");
  {
    auto w = IndexWriter::open(index, IndexSettings{});
    REQUIRE(w.ok());
    IndexRunOptions opts;
    opts.crawl.include = {"docs.jsonl"};
    auto rep = index_paths(**w, {LODE_TEST_DATA "/cranfield"}, opts);
    REQUIRE_MESSAGE(rep.ok(), rep.status().to_string());
    CHECK(rep->documents == 1400);
    CHECK(rep->failed == 0);
  }
  auto queries = read_queries(LODE_TEST_DATA "/cranfield/queries.tsv");
  REQUIRE(queries.ok());
  CHECK(queries->size() == 225);
  auto qrels = read_qrels(LODE_TEST_DATA "/cranfield/qrels.txt");
  REQUIRE(qrels.ok());
  OpenIndex idx = open_index(index);
  SearchOptions o;
  o.top = 1000;
  o.snippets = false;
  o.breakdown = false;
  Run run;
  for (auto& q : *queries) {
    auto r = idx.searcher->search(q.text, o);
    REQUIRE_MESSAGE(r.ok(), r.status().to_string());
    for (auto& h : r->hits) run[q.id].push_back(RunEntry{h.external_id, h.score});
  }
  Evaluation ev = evaluate(run, *qrels);
  CHECK(ev.per_query.size() == 225);
  MESSAGE("Cranfield BM25: MAP " << ev.mean.ap << ", nDCG@10 " << ev.mean.ndcg10 << ", P@10 " << ev.mean.p10);
  CHECK(ev.mean.ap >= 0.4309 - 0.01);
  CHECK(ev.mean.ndcg10 >= 0.5236 - 0.01);
}
