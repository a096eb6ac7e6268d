// File names that are not UTF-8 or hold control characters: --json prints
// them escaped (lode/names.h) and the escaped id names the document again;
// text output to a terminal cannot be steered by a name.
#include <doctest/doctest.h>

#include <nlohmann/json.hpp>
#include <set>

#include "harness.h"
#include "lode/names.h"

using namespace lode::testing;

TEST_CASE("a hit whose file name is not UTF-8 prints as JSON, and its id is given back to keyterms and nearest") {
  Scratch s;
  const std::string latin1 = "caf\xE9 log.txt";     // Latin-1 e-acute
  const std::string steering = "bell\x1b]0;x\x07.txt";  // would retitle a terminal
  s.write(latin1, "the barnacle count on the north pier was high\n");
  s.write(steering, "the barnacle count on the south pier was low\n");
  s.write("plain.txt", "no count was taken on the west pier\n");
  index_tree(s.index(), {s.tree()});
  const std::string at = "--index '" + s.index() + "' ";
  int rc = -1;
  const std::string out = lode_run(at + "search barnacle --json", &rc);
  REQUIRE_MESSAGE(rc == 0, out);
  const auto j = nlohmann::json::parse(out);
  std::set<std::string> docs;
  for (const auto& h : j["hits"]) docs.insert(h["doc"].get<std::string>());
  CHECK(docs == std::set<std::string>{lode::escape_name(latin1), steering});
  for (const std::string& doc : docs) {
    CAPTURE(doc);
    std::string given = lode_run(at + "keyterms '" + doc + "' --json", &rc);
    CHECK_MESSAGE(rc == 0, given);
    given = lode_run(at + "nearest '" + doc + "' --json", &rc);
    CHECK_MESSAGE(rc == 0, given);
  }
  // Not a terminal: the text output holds the name's exact bytes, for scripts.
  const std::string text = lode_run(at + "search barnacle", &rc);
  CHECK(text.find(latin1) != std::string::npos);
  // A terminal (script(1) gives the command one): escaped, the escape never sent.
  const std::string tty = lode::test::run("NO_COLOR=1 script -qec \"" + std::string(LODE_BINARY) + " " + at +
                                           "search barnacle\" /dev/null", &rc);
  CHECK(rc == 0);
  CHECK(tty.find("bell\\x1b]0;x\\x07.txt") != std::string::npos);
  CHECK(tty.find("caf\\xe9 log.txt") != std::string::npos);
  CHECK(tty.find('\x1b') == std::string::npos);
}
