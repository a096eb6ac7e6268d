// Every `lode ...` line of the README's shell examples, run as written on
// the sample archive from a folder laid out like the repository's top
// folder, must succeed and give results: a README example that finds
// nothing teaches a new user that lode does not work.
#include <nlohmann/json.hpp>
#include <fstream>
#include <regex>
#include <sstream>

#include "util.h"

using namespace lode;
using namespace lode::test;

namespace {

const std::string kLode = LODE_BINARY;

// The `lode` lines of the README's ```sh blocks, comments removed.
std::vector<std::string> readme_commands() {
  std::ifstream in(LODE_SOURCE_DIR "/README.md");
  REQUIRE(in.good());
  std::vector<std::string> out;
  std::string line;
  bool in_sh = false;
  while (std::getline(in, line)) {
    if (line.rfind("```", 0) == 0) {
      in_sh = !in_sh && line == "```sh";
      continue;
    }
    if (!in_sh || line.rfind("lode ", 0) != 0) continue;
    // Comments start after two spaces and a '#', never inside the command.
    if (auto hash = line.find("  #"); hash != std::string::npos) line.resize(hash);
    while (!line.empty() && line.back() == ' ') line.pop_back();
    out.push_back(line);
  }
  return out;
}

}  // namespace

TEST_CASE("README: every lode example gives results on the sample archive") {
  TempDir dir;
  fs::create_directories(dir.path() / "work");
  fs::create_symlink(LODE_SOURCE_DIR "/sample_corpus", dir.path() / "work" / "sample_corpus");
  const std::string bin_dir = fs::path(kLode).parent_path().string();
  // The default index and config live in the test's own XDG folders.
  const std::string prefix = "cd " + dir.str("work") + " && unset LODE_INDEX NO_COLOR && PATH=" + bin_dir +
                             ":$PATH XDG_DATA_HOME=" + dir.str("data") + " XDG_CONFIG_HOME=" + dir.str("config") +
                             " ";
  const auto commands = readme_commands();
  REQUIRE(commands.size() >= 20);
  REQUIRE(commands.front().rfind("lode index sample_corpus/archive", 0) == 0);  // the first search runs on the sample
  std::size_t ran = 0;
  for (const std::string& cmd : commands) {
    CAPTURE(cmd);
    // A server runs until stopped; the API is checked in tests/server/.
    if (cmd.rfind("lode serve", 0) == 0) continue;
    ++ran;
    int rc = -1;
    std::string out = run(prefix + cmd + " 2>" + dir.str("stderr"), &rc);
    std::ifstream err_in(dir.str("stderr"));
    std::stringstream err;
    err << err_in.rdbuf();
    CAPTURE(err.str());
    CHECK(rc == 0);
    if (cmd.find(" > ") != std::string::npos) {  // output redirected to a file in the folder
      std::ifstream f(dir.path() / "work" / cmd.substr(cmd.find(" > ") + 3));
      std::stringstream s;
      s << f.rdbuf();
      out = s.str();
    }
    if (cmd.rfind("lode index", 0) != 0) CHECK_FALSE(out.empty());  // index reports on stderr
    if (cmd.rfind("lode search", 0) == 0 && cmd.find("--batch") == std::string::npos) {
      if (cmd.find("--json") != std::string::npos) {
        auto j = nlohmann::json::parse(out);
        CHECK(j["hits"].size() >= 1);
      } else {
        std::smatch m;
        REQUIRE(std::regex_search(out, m, std::regex(R"((\d+) matching documents)")));
        CHECK(std::stoi(m[1]) >= 1);
        CHECK(out.find("  1. ") != std::string::npos);
      }
    }
    if (cmd.rfind("lode nearest", 0) == 0) CHECK(out.find("no similar document") == std::string::npos);
    if (cmd.rfind("lode twins", 0) == 0) CHECK(out.find("group 1:") != std::string::npos);
    if (cmd.rfind("lode index", 0) == 0) CHECK(fs::exists(dir.path() / "data" / "lode" / "index.sqlite"));
  }
  CHECK(ran >= 20);
  CHECK(fs::exists(dir.path() / "work" / "archive.mtx"));
  CHECK(fs::exists(dir.path() / "work" / "heat.svg"));
}
