// The explore commands through the real lode binary: JSON shapes, exit codes.
#include <nlohmann/json.hpp>

#include "fixture.h"

using namespace lode;
using namespace lode::test;

namespace {
struct Fixture {
  TempDir dir;
  std::string index;
  Fixture() {
    index = dir.str("c.sqlite");
    std::vector<std::pair<std::string, std::string>> docs = {
        {"Fog horn", "the fog horn compressor failed in the fog"},
        {"Fog horn again", "the fog horn compressor failed in the fog"},
        {"Kelp", "kelp beds grew after the storm"},
        {"Storm", "the storm broke the quay and the kelp washed in"},
    };
    build_index(index, docs);
  }
  std::string lode(const std::string& args, int* rc) {
    return run(std::string(LODE_BINARY) + " --index " + index + " " + args + " 2>&1", rc);
  }
};
}  // namespace

TEST_CASE("lode nearest / keyterms / twins / themes / matrix print their JSON schemas") {
  Fixture f;
  int rc = -1;
  auto like = nlohmann::json::parse(f.lode("nearest d1 --json", &rc));
  CHECK(rc == 0);
  CHECK(like["schema"] == "lode.nearest/1");
  REQUIRE(!like["hits"].empty());
  CHECK(like["hits"][0]["doc"] == "d2");
  CHECK(like["hits"][0]["similarity"].get<double>() > 0.99);

  auto kt = nlohmann::json::parse(f.lode("keyterms --query kelp --json", &rc));
  CHECK(rc == 0);
  CHECK(kt["schema"] == "lode.keyterms/1");
  CHECK(kt["documents"] == 2);

  auto tw = nlohmann::json::parse(f.lode("twins --json -q", &rc));
  CHECK(rc == 0);
  CHECK(tw["schema"] == "lode.twins/1");
  REQUIRE(tw["groups"].size() == 1);
  CHECK(tw["groups"][0]["docs"] == nlohmann::json({"d1", "d2"}));

  auto th = nlohmann::json::parse(f.lode("themes -k 2 --min-df 1 --json", &rc));
  CHECK(rc == 0);
  CHECK(th["schema"] == "lode.themes/1");
  CHECK(th["themes"].size() == 2);

  auto mx = nlohmann::json::parse(f.lode("matrix -q --out " + f.dir.str("x") + " --json", &rc));
  CHECK(rc == 0);
  CHECK(mx["schema"] == "lode.matrix/1");
  CHECK(mx["rows"] == 4);
  CHECK(fs::exists(f.dir.str("x.mtx")));
}

TEST_CASE("explore commands: unknown document exits 1 and bad options exit 2 with a message") {
  Fixture f;
  int rc = -1;
  std::string out = f.lode("nearest no-such-doc", &rc);
  CHECK(rc == 1);
  CHECK(out.find("no-such-doc") != std::string::npos);
  out = f.lode("matrix --out " + f.dir.str("y") + " --tf cubic", &rc);
  CHECK(rc == 2);
  CHECK(out.find("--tf") != std::string::npos);
  out = f.lode("keyterms", &rc);
  CHECK(rc == 2);
  out = f.lode("twins --threshold 2", &rc);
  CHECK(rc == 2);
  CHECK(out.find("threshold") != std::string::npos);
  out = f.lode("nearest d1 --vector-weighting lq", &rc);
  CHECK(rc == 2);
  CHECK(out.find("idf letter 'q'") != std::string::npos);
}
