// The byte escape for names that are not UTF-8, and the terminal form
// (lode/names.h): identity on ordinary names, exact round trips on any bytes.
#include <doctest/doctest.h>

#include <random>
#include <string>

#include "lode/analysis.h"
#include "lode/names.h"

TEST_CASE("names: UTF-8 names are unchanged, stray bytes become U+F780..U+F7FF and come back") {
  for (const std::string name : {"notes/log.txt", "Gezeitentafel für Mai.md", "灯台/日誌.txt", ""}) {
    CHECK(lode::escape_name(name) == name);
    CHECK_FALSE(lode::name_needs_escape(name));
    CHECK_FALSE(lode::holds_escaped_byte(name));
  }
  // Latin-1 "café.txt": the byte E9 becomes U+F7E9 (EF 9F A9 in UTF-8).
  const std::string latin1 = "caf\xE9.txt";
  const std::string escaped = lode::escape_name(latin1);
  CHECK(escaped == "caf\xEF\x9F\xA9.txt");
  CHECK(lode::is_valid_utf8(escaped));
  CHECK(lode::name_needs_escape(latin1));
  CHECK(lode::holds_escaped_byte(escaped));
  CHECK(lode::unescape_name(escaped) == latin1);
  // A name that already holds U+F7E9 is escaped byte by byte, so the two
  // names stay apart and each comes back as it was.
  const std::string holds = "caf\xEF\x9F\xA9.txt";
  CHECK(lode::escape_name(holds) != escaped);
  CHECK(lode::unescape_name(lode::escape_name(holds)) == holds);
}

TEST_CASE("names: any bytes round-trip through the escape as valid UTF-8") {
  std::mt19937 rng(20260314);  // fixed seed: a failure reproduces
  std::uniform_int_distribution<int> byte(1, 255), length(0, 40);
  for (int trial = 0; trial < 5000; ++trial) {
    std::string name;
    for (int i = length(rng); i > 0; --i) name += static_cast<char>(byte(rng));
    if (trial % 3 == 0) name += "\xEF\x9E\x80";  // U+F780 itself, often
    const std::string e = lode::escape_name(name);
    CAPTURE(trial);
    REQUIRE(lode::is_valid_utf8(e));
    REQUIRE(lode::unescape_name(e) == name);
    REQUIRE(lode::name_needs_escape(name) == (e != name));
  }
}

TEST_CASE("names: the terminal form shows control characters, backslashes and stray bytes as \\xHH") {
  CHECK(lode::terminal_name("log.txt") == "log.txt");
  CHECK(lode::terminal_name("für.txt") == "für.txt");
  CHECK(lode::terminal_name("a\x1b]0;owned\x07.txt") == "a\\x1b]0;owned\\x07.txt");
  CHECK(lode::terminal_name("line\nbreak") == "line\\x0abreak");
  CHECK(lode::terminal_name("caf\xE9") == "caf\\xe9");
  CHECK(lode::terminal_name("c1\xC2\x9B" "2J") == "c1\\xc2\\x9b2J");  // U+009B, the one-byte CSI
  CHECK(lode::terminal_name("back\\slash") == "back\\x5cslash");
  CHECK(lode::terminal_name("del\x7f") == "del\\x7f");
}
