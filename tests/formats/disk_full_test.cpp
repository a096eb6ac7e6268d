// A write the disk refuses names the index file: "database or disk is full"
// alone does not say which disk. SQLite's max_page_count makes a file full
// without filling a disk.
#include <doctest/doctest.h>

#include "harness.h"
#include "index/sqlite.h"

using namespace lode::testing;

TEST_CASE("a full index file is named in the error of the statement that hit it") {
  Scratch s;
  const std::string path = s.other("full.sqlite");
  auto db = lode::sql::Db::open(path, SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE);
  REQUIRE(db.ok());
  REQUIRE(db->exec("CREATE TABLE t(b BLOB); PRAGMA max_page_count = 8").ok());
  auto insert = db->prepare("INSERT INTO t(b) VALUES(?)");
  REQUIRE(insert.ok());
  lode::Status st;
  for (int i = 0; i < 100 && st.ok(); ++i) st = insert->bind_blob(1, std::string(4096, 'x')).run();
  REQUIRE_FALSE(st.ok());
  CHECK(st.message().find("full") != std::string::npos);
  CHECK_MESSAGE(st.message().find(path) != std::string::npos, st.message());
}
