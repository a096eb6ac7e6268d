// `lode eval` end to end with the real binary on the ADI collection
// (tests/data/adi, provenance in its SOURCE.md): metrics, scoring a saved
// run, comparisons across settings and indexes, sweeps, and errors.
#include <cmath>
#include <nlohmann/json.hpp>

#include "core/util.h"
#include "lode/eval.h"

using namespace lode;
using namespace lode::test;

namespace {
const std::string kLode = LODE_BINARY;
const std::string kAdi = LODE_TEST_DATA "/adi";
const std::string kData = " --queries " + kAdi + "/queries.tsv --judgments " + kAdi + "/qrels.txt ";

// Indexes ADI in `dir`; returns " --index FILE " for the command line.
std::string indexed_adi(TempDir& dir) {
  const std::string idx = " --index " + dir.str("adi.sqlite") + " ";
  int rc = -1;
  run(kLode + idx + "index -q --include docs.jsonl " + kAdi + " 2>&1", &rc);
  REQUIRE(rc == 0);
  return idx;
}
}  // namespace

TEST_CASE("lode eval: metrics / saved run scored again / compare with significance / sweep with SVG") {
  TempDir dir;
  const std::string idx = indexed_adi(dir);
  int rc = -1;
  run(kLode + " --index " + dir.str("adi-nostem.sqlite") + " index -q --language none --include docs.jsonl " + kAdi +
          " 2>&1",
      &rc);
  REQUIRE(rc == 0);

  auto ev = nlohmann::json::parse(run(kLode + idx + "eval --json --per-query --save-run " + dir.str("run.txt") + kData, &rc));
  REQUIRE(rc == 0);
  CHECK(ev["schema"] == "lode.eval/1");
  CHECK(ev["judged_queries"] == 35);
  CHECK(ev["per_query"].size() == 35);
  double map = ev["mean"]["map"].get<double>();
  CHECK(map > 0.2);
  // The saved run, scored as an outside run file, gives the same figures.
  auto again = nlohmann::json::parse(run(kLode + " eval --json --run " + dir.str("run.txt") + kData, &rc));
  REQUIRE(rc == 0);
  // Run files print scores with 6 decimals, so documents closer than that tie
  // in the file; ties keep the run's order, so the figures are the same.
  CHECK(again["mean"]["map"].get<double>() == doctest::Approx(map).epsilon(1e-12));
  CHECK(again["mean"]["ndcg@10"].get<double>() == doctest::Approx(ev["mean"]["ndcg@10"].get<double>()).epsilon(1e-12));
  // ... and so does the library on that file.
  auto lib = evaluate(read_run(dir.str("run.txt")).value(), read_qrels(kAdi + "/qrels.txt").value());
  CHECK(lib.mean.ndcg10 == doctest::Approx(again["mean"]["ndcg@10"].get<double>()).epsilon(1e-12));
  std::string text = run(kLode + idx + "eval --k 5" + kData, &rc);
  CHECK(rc == 0);
  for (const char* s : {"35 judged queries", "map", "ndcg@10", "p@5", "recall@1000", "11-pt precision"})
    CHECK_MESSAGE(text.find(s) != std::string::npos, s);

  auto cmp = nlohmann::json::parse(run(kLode + idx + "eval compare --json --metric ndcg@10" + kData +
                                           "--candidate '--feedback-docs 5' --candidate '--index " +
                                           dir.str("adi-nostem.sqlite") + "'",
                                       &rc));
  REQUIRE(rc == 0);
  REQUIRE(cmp["candidates"].size() == 2);
  for (auto& c : cmp["candidates"]) {
    auto& t = c["test"];
    CHECK(c["metric"] == "ndcg@10");
    CHECK(t["wins"].get<int>() + t["ties"].get<int>() + t["losses"].get<int>() == 35);
    CHECK(t["randomization"]["permutations"] == 100000);
    CHECK(t["randomization"]["exact"] == false);
    double p = t["randomization"]["p"].get<double>();
    CHECK((p > 0 && p <= 1));
    CHECK(t["t_test"]["df"] == 34);
  }
  CHECK(cmp["candidates"][1]["system"].get<std::string>().find("adi-nostem.sqlite") != std::string::npos);
  std::string cmp_text = run(kLode + idx + "eval compare" + kData + "--candidate '--k1 0.9 --b 0.4'", &rc);
  CHECK(rc == 0);
  for (const char* s : {"paired randomization test, two-sided, 100000 random sign flips (seed 20080707)",
                        "paired t-test, two-sided, df 34", "better", "worse"})
    CHECK_MESSAGE(cmp_text.find(s) != std::string::npos, s);

  std::string sw = run(kLode + idx + "eval sweep --k1 0.8,1.2 --b 0.5:0.75:0.25 --svg " + dir.str("heat.svg") + kData, &rc);
  CHECK(rc == 0);
  CHECK(sw.find("best: --k1") != std::string::npos);
  std::string svg = read_text(dir.path() / "heat.svg");
  CHECK(svg.find("</svg>") != std::string::npos);
  CHECK(svg.find(">map<") != std::string::npos);
}

TEST_CASE("lode eval and search --batch read judged queries as plain text unless --query-syntax") {
  TempDir dir;
  const std::string idx = indexed_adi(dir);
  int rc = -1;
  // ADI's questions with an unbalanced quote in front and a dash before the
  // second word: plain text must rank them exactly as the questions as written.
  auto queries = read_queries(kAdi + "/queries.tsv");
  REQUIRE(queries.ok());
  std::string marked;
  for (const QueryLine& q : *queries) {
    std::string text = q.text;
    const std::size_t space = text.find(' ');
    if (space != std::string::npos) text.insert(space + 1, "-");
    marked += q.id + "\t\"" + text + "\n";
  }
  write_file(dir.path() / "marked.tsv", marked);
  const std::string judged = " --judgments " + kAdi + "/qrels.txt --queries ";
  auto as_written = nlohmann::json::parse(run(kLode + idx + "eval --json" + judged + kAdi + "/queries.tsv", &rc));
  REQUIRE(rc == 0);
  auto plain = nlohmann::json::parse(run(kLode + idx + "eval --json" + judged + dir.str("marked.tsv"), &rc));
  REQUIRE(rc == 0);
  auto syntax =
      nlohmann::json::parse(run(kLode + idx + "eval --json --query-syntax" + judged + dir.str("marked.tsv"), &rc));
  REQUIRE(rc == 0);
  CHECK(plain["mean"]["map"].get<double>() == as_written["mean"]["map"].get<double>());
  CHECK(syntax["mean"]["map"].get<double>() < as_written["mean"]["map"].get<double>() - 0.1);
  CHECK(plain["system"].get<std::string>().find("queries read as plain text") != std::string::npos);
  CHECK(syntax["system"].get<std::string>().find("queries parsed as query syntax") != std::string::npos);
  // search --batch: the same run as the questions as written; stderr says how they were read.
  std::string a = run(kLode + idx + "search --batch " + kAdi + "/queries.tsv 2>/dev/null", &rc);
  REQUIRE(rc == 0);
  std::string b = run(kLode + idx + "search --batch " + dir.str("marked.tsv") + " 2>" + dir.str("err.txt"), &rc);
  REQUIRE(rc == 0);
  CHECK(a == b);
  CHECK(read_text(dir.path() / "err.txt").find("queries read as plain text") != std::string::npos);
  std::string c = run(kLode + idx + "search --query-syntax --batch " + dir.str("marked.tsv") + " 2>&1", &rc);
  REQUIRE(rc == 0);
  CHECK(c.find("queries parsed as query syntax") != std::string::npos);
  CHECK(c != a);
}

TEST_CASE("lode eval: bad input gets a clear error and exit code") {
  TempDir dir;
  int rc = -1;
  std::string out = run(kLode + " eval --run /nonexistent/run.txt --judgments " + kAdi + "/qrels.txt 2>&1", &rc);
  CHECK(rc == 1);
  CHECK(out.find("/nonexistent/run.txt") != std::string::npos);
  write_file(dir.path() / "bad-qrels.txt", "1 0 3 1\n1 0 4 yes\n");
  out = run(kLode + " eval --run " + dir.str("bad-qrels.txt") + " --judgments " + dir.str("bad-qrels.txt") + " 2>&1", &rc);
  CHECK(rc == 2);
  CHECK(out.find(dir.str("bad-qrels.txt") + ":2:") != std::string::npos);
  write_file(dir.path() / "run.txt", "1 Q0 3 1 1.0 x\n");
  out = run(kLode + " eval compare --metric ndcg@0 --run " + dir.str("run.txt") + " --judgments " + kAdi +
                "/qrels.txt --candidate '--run " + dir.str("run.txt") + "' 2>&1",
            &rc);
  CHECK(rc == 2);
  CHECK(out.find("ndcg@0") != std::string::npos);
  out = run(kLode + " eval compare --run " + dir.str("run.txt") + " --judgments " + kAdi +
                "/qrels.txt --candidate '--no-such-option' 2>&1",
            &rc);
  CHECK(rc == 2);
  CHECK(out.find("--no-such-option") != std::string::npos);
  out = run(kLode + " --index " + dir.str("none.sqlite") + " eval sweep --judgments " + kAdi + "/qrels.txt --queries " +
                kAdi + "/queries.tsv 2>&1",
            &rc);
  CHECK(rc == 2);  // no values to sweep
}
