// An index of format 1 (before doc_meta and problems) is refused with a
// message that says to re-index (docs/index-format.md).
#include <sqlite3.h>

#include <doctest/doctest.h>

#include "harness.h"

namespace {

using namespace lode::testing;

TEST_CASE("an index of format 1 is refused with a message to re-index") {
  Scratch s;
  s.write("a.txt", "some words\n");
  index_tree(s.index(), {s.tree()});
  sqlite3* db = nullptr;
  REQUIRE(sqlite3_open(s.index().c_str(), &db) == SQLITE_OK);
  REQUIRE(sqlite3_exec(db, "UPDATE meta SET value = 1 WHERE key = 'format_version'", nullptr, nullptr, nullptr) ==
          SQLITE_OK);
  sqlite3_close(db);
  auto reader = lode::IndexReader::open(s.index());
  REQUIRE_FALSE(reader.ok());
  CHECK(reader.status().message().find("index format 1 is older") != std::string::npos);
  CHECK(reader.status().message().find("re-index") != std::string::npos);
  auto writer = lode::IndexWriter::open(s.index(), std::nullopt);
  REQUIRE_FALSE(writer.ok());
  CHECK(writer.status().message().find("re-index") != std::string::npos);
}

}  // namespace
