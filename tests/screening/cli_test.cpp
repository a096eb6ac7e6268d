// A whole review of the sample archive through the real lode binary, the
// judgments exported as qrels and read back by `lode eval`; why-not and
// what-moved from the command line.
#include <nlohmann/json.hpp>

#include "lode/eval.h"
#include "server/server_util.h"

using namespace lode;
using namespace lode::test;

namespace {

struct Cli {
  TempDir dir;
  std::string index = dir.str("sample.sqlite");
  Cli() { index_sample(index); }
  std::string lode(const std::string& args, int* rc) {
    return run(kLode + " --index " + index + " " + args + " 2>&1", rc);
  }
  nlohmann::json json(const std::string& args) {
    int rc = -1;
    std::string out = lode(args, &rc);
    REQUIRE_MESSAGE(rc == 0, args << ": " << out);
    auto j = nlohmann::json::parse(out, nullptr, false);
    REQUIRE_MESSAGE(!j.is_discarded(), out);
    return j;
  }
};

}  // namespace

TEST_CASE("lode sift: a review of the sample archive from start to qrels that lode eval reads") {
  Cli c;
  auto qrels = read_qrels(LODE_SOURCE_DIR "/sample_corpus/qrels.txt");
  REQUIRE(qrels.ok());
  const auto& truth = (*qrels)["q04"];  // fog horn compressor overheating
  auto st = c.json("sift start fog \"fog horn compressor\" --by ada --json");
  CHECK(st["schema"] == "lode.sift/1");
  CHECK(st["judged"] == 0);
  CHECK(st["recall"].is_null());
  std::size_t judged = 0, found = 0;
  for (int round = 0; round < 8; ++round) {
    auto b = c.json("sift next fog --json");
    CHECK(b["schema"] == "lode.sift-batch/1");
    CHECK(b["kind"] == "ranked");
    std::string yes, no;
    for (auto& it : b["items"]) {
      std::string d = it["doc"];
      auto t = truth.find(d);
      bool rel = t != truth.end() && t->second > 0;
      (rel ? yes : no) += " " + d;
      ++judged;
      found += rel;
    }
    st = c.json("sift mark fog" + (yes.empty() ? "" : " --yes" + yes) + (no.empty() ? "" : " --no" + no) +
                " --by ada --json");
  }
  CHECK(st["judged"] == judged);
  CHECK(st["relevant"] == found);
  CHECK(st["stop"]["reviewed"] == judged);
  CHECK(found >= 3);  // the classifier finds the fog horn notes early
  auto chk = c.json("sift check fog --size 5 --json");
  CHECK(chk["kind"] == "check");
  std::string no;
  for (auto& it : chk["items"]) no += " " + it["doc"].get<std::string>();
  st = c.json("sift mark fog --no" + no + " --json");
  CHECK(st["recall"]["sample"] == 5);
  CHECK(st["recall"]["estimate"].get<double>() <= 1.0);

  int rc = -1;
  std::string text = c.lode("sift status fog", &rc);
  CHECK(rc == 0);
  CHECK(text.find("stopping (knee rule)") != std::string::npos);
  CHECK(text.find("recall estimate") != std::string::npos);
  std::string out = c.dir.str("fog.qrels");
  c.lode("sift qrels fog --qid q04 -o " + out, &rc);
  REQUIRE(rc == 0);
  auto exported = read_qrels(out);
  REQUIRE_MESSAGE(exported.ok(), exported.status().to_string());
  CHECK((*exported)["q04"].size() == judged + 5);
  write_file(c.dir.path() / "q.tsv", "q04\tfog horn compressor overheating\n");
  auto ev = c.json("eval --queries " + c.dir.str("q.tsv") + " --judgments " + out + " --json");
  CHECK(ev["schema"] == "lode.eval/1");
  auto list = c.json("sift list --json");
  CHECK(list["sifts"].size() == 1);
}

TEST_CASE("lode sift review: judging on the terminal from standard input") {
  Cli c;
  int rc = -1;
  c.lode("sift start tides \"tide gauge\"", &rc);
  REQUIRE(rc == 0);
  std::string out = run("printf 'y\\nn\\nq\\n' | " + kLode + " --index " + c.index + " sift review tides --by bo 2>&1", &rc);
  CHECK_MESSAGE(rc == 0, out);
  auto st = c.json("sift status tides --json --judgments");
  CHECK(st["judged"] == 2);
  CHECK(st["judgments"][0]["reviewer"] == "bo");
  CHECK(st["judgments"][0]["relevant"] == true);
  CHECK(st["judgments"][1]["relevant"] == false);
}

TEST_CASE("lode sift: errors name the sift, the document or the option") {
  Cli c;
  int rc = -1;
  std::string out = c.lode("sift next nosuch", &rc);
  CHECK(rc == 1);
  CHECK(out.find("no sift named 'nosuch'") != std::string::npos);
  c.lode("sift start a \"fog\"", &rc);
  REQUIRE(rc == 0);
  out = c.lode("sift mark a --yes not/a/doc.md", &rc);
  CHECK(rc == 1);
  CHECK(out.find("not/a/doc.md") != std::string::npos);
  out = c.lode("sift start b \"fog\" --first-batch 0", &rc);
  CHECK(rc == 2);
  CHECK(out.find("first batch") != std::string::npos);
}

TEST_CASE("lode whynot and lode moved print their JSON and text") {
  Cli c;
  auto w = c.json("whynot \"fog horn compressor\" notes/maintenance/generator-no2-fuel-filter.md --json");
  CHECK(w["schema"] == "lode.whynot/1");
  CHECK(w["doc"] == "notes/maintenance/generator-no2-fuel-filter.md");
  CHECK(w["words"].size() == 3);
  CHECK(w["kth"].is_object());
  auto m = c.json("moved \"fog horn compressor\" --before \"--k1 0.5 --b 0.2\" --k1 2 --json");
  CHECK(m["schema"] == "lode.moved/1");
  CHECK(m["before"]["k1"] == 0.5);
  CHECK(m["after"]["k1"] == 2.0);
  CHECK(m["docs"].size() >= 1);
  int rc = -1;
  std::string text = c.lode("moved \"fog horn\" --before \"--title-weight 0\"", &rc);
  CHECK(rc == 0);
  CHECK(text.find("entered") != std::string::npos);
  std::string bad = c.lode("moved fog --before \"--k1 nope\"", &rc);
  CHECK(rc == 2);
  CHECK(bad.find("--before") != std::string::npos);
}
