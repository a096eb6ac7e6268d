// Reading qrels, runs and queries: the standard TREC forms, JSON Lines
// queries, and errors that name the file and line.
#include "core/util.h"
#include "lode/eval.h"

using namespace lode;

TEST_CASE("runs: ordered by score, ties in the run's order / duplicates and bad scores refused with the line") {
  auto run = parse_run("q1 Q0 a 1 2.5 t\nq1 Q0 b 2 3.0 t\nq1 Q0 c 3 2.5 t\n\nq2 Q0 z 1 1 t\n", "r.txt");
  REQUIRE(run.ok());
  REQUIRE((*run)["q1"].size() == 3);
  CHECK((*run)["q1"][0].docid == "b");
  CHECK((*run)["q1"][1].docid == "a");  // tie at 2.5: the order of the file
  CHECK((*run)["q1"][2].docid == "c");
  auto reversed = parse_run("q1 Q0 c 1 2.5 t\nq1 Q0 a 2 2.5 t\n", "r.txt");
  REQUIRE(reversed.ok());
  CHECK((*reversed)["q1"][0].docid == "c");
  auto dup = parse_run("q1 Q0 a 1 2 t\nq1 Q0 a 2 1 t\n", "r.txt");
  REQUIRE(!dup.ok());
  CHECK(dup.status().message().find("r.txt:2:") == 0);
  auto bad = parse_run("q1 Q0 a 1 2x t\n", "r.txt");
  CHECK(bad.status().message().find("r.txt:1:") == 0);
  CHECK(!parse_run("q1 Q0 a 1 nan t\n", "r.txt").ok());
  CHECK(!parse_run("q1 Q0 a 1\n", "r.txt").ok());
  // format_run writes what parse_run reads.
  auto again = parse_run(format_run(*run, "tag"), "again");
  REQUIRE(again.ok());
  CHECK((*again)["q1"][0].docid == "b");
  CHECK((*again)["q2"].size() == 1);
}

TEST_CASE("qrels: grades / errors name the line") {
  auto q = parse_qrels("1 0 d1 2\n1 0 d2 0\n2 0 d9 1\n", "j.txt");
  REQUIRE(q.ok());
  CHECK((*q)["1"]["d1"] == 2);
  CHECK((*q)["1"]["d2"] == 0);
  auto bad = parse_qrels("1 0 d1 2\n1 0 d2 high\n", "j.txt");
  REQUIRE(!bad.ok());
  CHECK(bad.status().message().find("j.txt:2:") == 0);
  CHECK(read_qrels("/nonexistent/qrels.txt").status().message().find("/nonexistent/qrels.txt") == 0);
}

TEST_CASE("queries: tab-separated and JSON Lines / comments skipped / duplicates refused") {
  auto q = parse_queries("# comment\n1\tstorm surge\r\n{\"id\": \"2\", \"text\": \"kelp\"}\n{\"id\": 3, \"text\": \"seal\"}\n",
                         "q.tsv");
  REQUIRE(q.ok());
  REQUIRE(q->size() == 3);
  CHECK((*q)[0].text == "storm surge");
  CHECK((*q)[1].id == "2");
  CHECK((*q)[2].id == "3");
  for (const char* bad : {"no tab here\n", "{\"id\": \"1\"}\n", "{not json\n", "1\ta\n1\tb\n"}) {
    CAPTURE(bad);
    auto e = parse_queries(bad, "q.tsv");
    REQUIRE(!e.ok());
    CHECK(e.status().message().find("q.tsv:") == 0);
  }
}

TEST_CASE("evaluate: unjudged queries listed and left out / missing queries count zero / depth and k apply") {
  Qrels qrels = {{"1", {{"a", 1}, {"b", 1}}}, {"2", {{"x", 1}}}, {"3", {{"n", 0}}}};
  Run run = {{"1", {{"c", 3}, {"a", 2}, {"b", 1}}}, {"3", {{"n", 1}}}, {"9", {{"a", 1}}}};
  Evaluation ev = evaluate(run, qrels, EvalOptions{2, 2});
  REQUIRE(ev.per_query.size() == 2);  // queries 1 and 2 have relevant judgments
  CHECK(ev.unjudged == std::vector<std::string>{"3", "9"});
  CHECK(ev.per_query[0].ap == doctest::Approx(0.25));      // depth 2: only "a" at rank 2 counts: (1/2)/2
  CHECK(ev.per_query[0].recall_depth == doctest::Approx(0.5));
  CHECK(ev.per_query[0].p_k == doctest::Approx(0.5));
  CHECK(ev.per_query[0].judged_k == 1);
  CHECK(ev.per_query[0].unjudged_k == 1);
  CHECK(ev.per_query[1].ap == 0);  // judged, not in the run
  CHECK(ev.mean.ap == doctest::Approx(0.125));
  auto m = parse_metric("ndcg@5");
  REQUIRE(m.ok());
  CHECK(m->k == 5);
  CHECK(metric_name(*m) == "ndcg@5");
  CHECK(metric_name(parse_metric("p").value(), EvalOptions{7, 100}) == "p@7");
  for (const char* bad : {"mapp", "map@3", "ndcg@", "ndcg@0", "p@x"}) CHECK(!parse_metric(bad).ok());
}
