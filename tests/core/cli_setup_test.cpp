// Where the lode binary keeps its index and reads its defaults: XDG base
// folders, LODE_INDEX, --index and the config file, with the documented
// precedence option > environment > config file > default. Every run here
// sets its own XDG folders, so nothing touches the real home.
#include <nlohmann/json.hpp>

#include "util.h"

using namespace lode;
using namespace lode::test;

namespace {

const std::string kLode = LODE_BINARY;

// Three tiny archives, each with a word only it has, to tell the indexes apart.
struct Homes {
  TempDir dir;
  std::string env;  // XDG_* and HOME for a run, LODE_INDEX unset
  Homes() {
    for (const std::string name : {"alpha", "beta", "gamma"})
      write_file(dir.path() / ("src-" + name) / "note.txt", "Note\nthe word " + name + " lives here");
    env = "unset LODE_INDEX LODE_SERVE_TOKEN; HOME=" + dir.str("home") + " XDG_DATA_HOME=" + dir.str("data") +
          " XDG_CONFIG_HOME=" + dir.str("config") + " ";
  }
  std::string lode(const std::string& args, int* rc, const std::string& extra_env = "") const {
    return run(env + extra_env + kLode + " " + args + " 2>&1", rc);
  }
  // Which archive the search reaches: the word it finds.
  std::string which(const std::string& extra_env = "", const std::string& flag = "") const {
    for (const std::string name : {"alpha", "beta", "gamma"}) {
      int rc = -1;
      auto out = run(env + extra_env + kLode + flag + " search --json " + name + " 2>/dev/null", &rc);
      if (rc != 0) continue;
      auto j = nlohmann::json::parse(out, nullptr, false);
      if (!j.is_discarded() && !j["hits"].empty()) return name;
    }
    return "none";
  }
};

}  // namespace

TEST_CASE("CLI: the default index lives under XDG_DATA_HOME, and option > environment > config > default") {
  Homes h;
  int rc = -1;
  // Default: $XDG_DATA_HOME/lode/index.sqlite, its folder created.
  std::string out = h.lode("index " + h.dir.str("src-alpha"), &rc);
  REQUIRE_MESSAGE(rc == 0, out);
  CHECK(fs::exists(h.dir.path() / "data" / "lode" / "index.sqlite"));
  CHECK(out.find(h.dir.str("data") + "/lode/index.sqlite") != std::string::npos);  // the summary names it
  CHECK(h.which() == "alpha");
  // Without XDG_DATA_HOME: ~/.local/share/lode/.
  out = run("unset LODE_INDEX XDG_DATA_HOME; HOME=" + h.dir.str("home") + " XDG_CONFIG_HOME=" + h.dir.str("config") +
                " " + kLode + " index -q " + h.dir.str("src-alpha") + " 2>&1",
            &rc);
  REQUIRE_MESSAGE(rc == 0, out);
  CHECK(fs::exists(h.dir.path() / "home" / ".local" / "share" / "lode" / "index.sqlite"));

  // The config file's index beats the default (a relative path is relative to the file).
  write_file(h.dir.path() / "config" / "lode" / "config", "index = beta.sqlite\n");
  out = h.lode("index -q " + h.dir.str("src-beta"), &rc);
  REQUIRE_MESSAGE(rc == 0, out);
  CHECK(fs::exists(h.dir.path() / "config" / "lode" / "beta.sqlite"));
  CHECK(h.which() == "beta");
  // LODE_INDEX beats the config file.
  const std::string gamma_env = "LODE_INDEX=" + h.dir.str("gamma.sqlite") + " ";
  out = h.lode("index -q " + h.dir.str("src-gamma"), &rc, gamma_env);
  REQUIRE_MESSAGE(rc == 0, out);
  CHECK(h.which(gamma_env) == "gamma");
  // --index beats the environment.
  CHECK(h.which(gamma_env, " --index " + h.dir.str("config/lode/beta.sqlite")) == "beta");
}

TEST_CASE("CLI: the config file sets model and field weights and options still win") {
  Homes h;
  int rc = -1;
  REQUIRE(h.lode("index -q " + h.dir.str("src-alpha"), &rc).empty());
  write_file(h.dir.path() / "config" / "lode" / "config", "model = tfidf\ntitle_weight = 4\n");
  auto j = nlohmann::json::parse(h.lode("search --json alpha", &rc));
  CHECK(rc == 0);
  CHECK(j["model"]["name"] == "tfidf");
  CHECK(j["model"]["field_weights"]["title"] == 4.0);
  j = nlohmann::json::parse(h.lode("search --json --model bm25 --title-weight 1 alpha", &rc));
  CHECK(j["model"]["name"] == "bm25");
  CHECK(j["model"]["field_weights"]["title"] == 1.0);
}

TEST_CASE("CLI: a bad config file stops every command with exit 2 naming the file and line") {
  Homes h;
  write_file(h.dir.path() / "config" / "lode" / "config", "# mine\nmodel = bm25\nmodle = tfidf\n");
  int rc = -1;
  std::string out = h.lode("stats", &rc);
  CHECK(rc == 2);
  CHECK(out.find(h.dir.str("config") + "/lode/config:3: unknown key 'modle'") != std::string::npos);
}
