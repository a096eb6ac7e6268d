// Queries on the command line: a query may begin with '-', warnings reach
// the text and the JSON output, --log-base takes e everywhere, NO_COLOR.
#include <nlohmann/json.hpp>

#include "util.h"

using namespace lode;
using namespace lode::test;

namespace {
const std::string kLode = LODE_BINARY;
const std::string kCorpus = LODE_SOURCE_DIR "/sample_corpus/archive";

struct Sample {
  TempDir dir;
  std::string idx;
  Sample() : idx(" --index " + dir.str("s.sqlite") + " ") {
    int rc = -1;
    std::string out = run(kLode + idx + "index -q " + kCorpus + " 2>&1", &rc);
    REQUIRE_MESSAGE(rc == 0, out);
  }
  std::string lode(const std::string& args, int* rc) const { return run(kLode + idx + args + " 2>&1", rc); }
  nlohmann::json json(const std::string& args, int* rc) const {
    return nlohmann::json::parse(run(kLode + idx + args + " 2>/dev/null", rc));
  }
};

bool has_warning(const nlohmann::json& j, const std::string& part) {
  for (auto& w : j["warnings"])
    if (w.get<std::string>().find(part) != std::string::npos) return true;
  return false;
}
}  // namespace

TEST_CASE("CLI: a query may begin with '-', before or after the options") {
  Sample s;
  int rc = -1;
  auto only = s.json("search --json '-storm'", &rc);
  CHECK(rc == 0);
  CHECK(only["query"] == "-storm");
  CHECK(only["hits"].empty());
  CHECK(has_warning(only, "only excluded words"));
  auto mixed = s.json("search '-draft storm' --json --top 3", &rc);
  CHECK(rc == 0);
  CHECK(mixed["query"] == "-draft storm");
  CHECK(mixed["hits"].size() == 3);
  for (auto& h : mixed["hits"]) CHECK(h["doc"].get<std::string>().find("draft") == std::string::npos);
  // The same for an option's value.
  std::string out = s.lode("keyterms --query '-draft storm'", &rc);
  CHECK(rc == 0);
  // A mistyped option is still an error naming it, not a query.
  out = s.lode("search --topp 3 storm", &rc);
  CHECK(rc == 2);
  CHECK(out.find("--topp") != std::string::npos);
}

TEST_CASE("CLI: query warnings in the text output and the JSON") {
  Sample s;
  int rc = -1;
  std::string text = s.lode("search '\"north quay'", &rc);
  CHECK(rc == 0);
  CHECK(text.find("lode: note: unbalanced quote") != std::string::npos);
  text = s.lode("search 'author:tulloch storm'", &rc);
  CHECK(text.find("'author:' is not a field") != std::string::npos);
  auto j = s.json("search --json 'storm @kind:spreadsheet'", &rc);
  CHECK(rc == 0);
  CHECK(has_warning(j, "@kind:spreadsheet matches no document"));
  // An unknown filter name is an error naming it.
  text = s.lode("search 'storm @author:tulloch'", &rc);
  CHECK(rc == 2);
  CHECK(text.find("@author:tulloch") != std::string::npos);
}

TEST_CASE("CLI: --log-base takes e in search as in the explore commands") {
  Sample s;
  int rc = -1;
  auto j = s.json("search --json --model tfidf --log-base e kelp", &rc);
  CHECK(rc == 0);
  CHECK(std::abs(j["model"]["log_base"].get<double>() - 2.718281828459045) < 1e-12);
  std::string out = s.lode("search --model tfidf --log-base one kelp", &rc);
  CHECK(rc == 2);
  CHECK(out.find("--log-base must be a number above 1 or e, not 'one'") != std::string::npos);
  // The explore commands' two letters have their own option; --weighting there is unknown.
  out = s.lode("themes -k 2 --vector-weighting nt --log-base e --json", &rc);
  CHECK(rc == 0);
  out = s.lode("themes -k 2 --weighting lt", &rc);
  CHECK(rc == 2);
}

TEST_CASE("CLI: bold snippet words on a terminal, none with NO_COLOR") {
  Sample s;
  int rc = -1;
  // util-linux `script` gives lode a terminal for stdout.
  auto on_tty = [&](const std::string& env) {
    return run(env + "script -qec \"" + kLode + s.idx + "search --top 1 storm\" /dev/null", &rc);
  };
  std::string styled = on_tty("");
  CHECK(rc == 0);
  CHECK(styled.find("\033[1m") != std::string::npos);
  std::string plain = on_tty("NO_COLOR=1 ");
  CHECK(rc == 0);
  CHECK(plain.find("\033[") == std::string::npos);
  CHECK(plain.find('[') != std::string::npos);  // marks as [brackets] instead
}
