// The lode binary end to end on the bundled sample corpus: index, search in
// text, JSON and batch (TREC run) form, stats, errors and exit codes.
#include <nlohmann/json.hpp>
#include <sstream>

#include "util.h"

using namespace lode;
using namespace lode::test;

namespace {
const std::string kLode = LODE_BINARY;
const std::string kCorpus = LODE_SOURCE_DIR "/sample_corpus/archive";
}  // namespace

TEST_CASE("CLI: index the sample corpus, search, explain, batch, stats") {
  TempDir dir;
  std::string idx = " --index " + dir.str("s.sqlite") + " ";
  int rc = -1;
  run(kLode + idx + "index -q " + kCorpus + " 2>&1", &rc);
  REQUIRE(rc == 0);

  auto stats = nlohmann::json::parse(run(kLode + idx + "stats --json", &rc));
  CHECK(rc == 0);
  CHECK(stats["documents"].get<int>() >= 150);
  CHECK(stats["analyzer"]["language"] == "english");

  // JSON hits carry a breakdown that sums to the score.
  auto res = nlohmann::json::parse(run(kLode + idx + "search --json --top 5 'storm damage'", &rc));
  CHECK(rc == 0);
  CHECK(res["schema"] == "lode.search/1");
  REQUIRE(res["hits"].size() == 5);
  for (auto& h : res["hits"]) {
    double sum = 0;
    for (auto& c : h["breakdown"]) sum += c["contribution"].get<double>();
    CHECK(std::abs(sum - h["score"].get<double>()) < 1e-9);
    CHECK(!h["snippet"]["text"].get<std::string>().empty());
    CHECK(h["snippet"]["marks"].size() >= 1);
  }

  // The same query through the environment variable.
  std::string env = "LODE_INDEX=" + dir.str("s.sqlite") + " ";
  auto res2 = nlohmann::json::parse(run(env + kLode + " search --json --top 5 'storm damage'", &rc));
  CHECK(res2["hits"] == res["hits"]);

  // A pruned count says what it is; --count-all gives the exact number.
  auto pruned = nlohmann::json::parse(run(kLode + idx + "search --json --top 1 --k1 0 'storm damage'", &rc));
  REQUIRE(pruned["matched_exact"] == false);
  std::string counted = run(kLode + idx + "search --top 1 --k1 0 'storm damage'", &rc);
  CHECK(counted.find("at least " + std::to_string(pruned["matched"].get<int>()) + " matching documents") == 0);
  CHECK(counted.find("counting stops once the top 1 are certain") != std::string::npos);
  auto exact = nlohmann::json::parse(run(kLode + idx + "search --json --count-all --top 1 --k1 0 'storm damage'", &rc));
  CHECK(exact["matched_exact"] == true);
  CHECK(exact["matched"].get<int>() >= pruned["matched"].get<int>());
  counted = run(kLode + idx + "search --count-all --top 1 --k1 0 'storm damage'", &rc);
  CHECK(counted.find(std::to_string(exact["matched"].get<int>()) + " matching documents") == 0);

  // Text output with the breakdown table.
  std::string text = run(kLode + idx + "search --why --top 2 'storm damage'", &rc);
  CHECK(rc == 0);
  CHECK(text.find("contribution") != std::string::npos);
  CHECK(text.find("= score") != std::string::npos);

  // Batch mode prints a standard 6-column TREC run.
  write_file(dir.path() / "q.tsv", "q1\tstorm damage\nq2\tgenerator maintenance\n");
  std::string runfile = run(kLode + idx + "search --batch " + dir.str("q.tsv") + " --top 3", &rc);
  CHECK(rc == 0);
  std::istringstream lines(runfile);
  std::string line;
  int n = 0;
  while (std::getline(lines, line)) {
    std::istringstream f(line);
    std::string qid, q0, doc, rank, score, tag, extra;
    f >> qid >> q0 >> doc >> rank >> score >> tag;
    CHECK(q0 == "Q0");
    CHECK(tag == "lode-bm25");
    CHECK(!(f >> extra));
    ++n;
  }
  CHECK(n == 6);

  // Bad input: exit codes and messages naming what is wrong.
  std::string err = run(kLode + idx + "search --model nope 'x' 2>&1", &rc);
  CHECK(rc == 2);
  CHECK(err.find("--model") != std::string::npos);
  err = run(kLode + " --index " + dir.str("missing.sqlite") + " search x 2>&1", &rc);
  CHECK(rc == 1);
  CHECK(err.find("no index at") != std::string::npos);
  err = run(kLode + idx + "index " + dir.str("no-such-folder") + " 2>&1", &rc);
  CHECK(rc != 0);
  CHECK(err.find("no-such-folder") != std::string::npos);
}

TEST_CASE("CLI: BM25 and TF-IDF rank some sample queries differently") {
  TempDir dir;
  std::string idx = " --index " + dir.str("s.sqlite") + " ";
  int rc = -1;
  run(kLode + idx + "index -q " + kCorpus + " 2>&1", &rc);
  REQUIRE(rc == 0);
  int differing = 0;
  for (const char* q : {"generator", "storm", "seal pups", "fog horn", "kelp", "lamp"}) {
    auto ids = [&](const char* model) {
      auto j = nlohmann::json::parse(run(kLode + idx + "search --json --top 5 --model " + model + " '" + q + "'"));
      std::vector<std::string> out;
      for (auto& h : j["hits"]) out.push_back(h["doc"]);
      return out;
    };
    differing += ids("bm25") != ids("tfidf");
  }
  CHECK(differing >= 2);
}
