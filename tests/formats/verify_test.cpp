// verify_index() and `lode verify`: a sound index built through a history of
// changes passes; each kind of damage, made with SQLite on a copy, is named.
#include <sqlite3.h>

#include <doctest/doctest.h>

#include "harness.h"
#include "lode/verify.h"

namespace {

using namespace lode::testing;

void sql_exec(const std::string& db, const std::string& sql) {
  sqlite3* h = nullptr;
  REQUIRE(sqlite3_open(db.c_str(), &h) == SQLITE_OK);
  char* err = nullptr;
  const int rc = sqlite3_exec(h, sql.c_str(), nullptr, nullptr, &err);
  const std::string msg = err ? err : "";
  sqlite3_free(err);
  sqlite3_close(h);
  REQUIRE_MESSAGE(rc == SQLITE_OK, msg);
}

// An index with a history: files added, changed (dead documents), removed,
// an empty file, JSON Lines records, and small commits that refill segments.
void build_history(const Scratch& s) {
  std::string many;
  for (int i = 0; i < 300; ++i)
    many += "{\"id\":\"r" + std::to_string(i) + "\",\"title\":\"tide " + std::to_string(i % 7) +
            "\",\"text\":\"the lamp keeper logged the tide at " + std::to_string(i) + " and the fog came in\"}\n";
  s.write("records.jsonl", many);
  s.write("notes/a.md", "# Lamp room\n\nThe lamp room glass was cleaned twice; the lamp burned all night.\n");
  s.write("notes/b.txt", "Fog signal tested. Fog again at dawn, fog horn sounded for an hour.\n");
  s.write("empty.txt", "");
  index_tree(s.index(), {s.tree()});
  s.write("notes/b.txt", "Fog signal repaired; the keeper wrote the tide table again.\n");
  s.write("notes/c.txt", "A gale took the weather vane; the tide rose over the slipway.\n");
  index_tree(s.index(), {s.tree()});
  std::filesystem::remove(s.file("notes/a.md"));
  index_tree(s.index(), {s.tree()});
}

lode::VerifyReport verify(const std::string& path) {
  auto r = lode::verify_index(path);
  REQUIRE_MESSAGE(r.ok(), r.status().to_string());
  return std::move(r).value();
}

bool names(const lode::VerifyReport& r, const std::string& words) {
  for (const auto& f : r.findings)
    if (f.find(words) != std::string::npos) return true;
  return false;
}

std::string all(const lode::VerifyReport& r) {
  std::string out;
  for (const auto& f : r.findings) out += f + "\n";
  return out;
}

}  // namespace

TEST_CASE("verify: an index built through adds, changes and removals is sound, and lode verify says so") {
  Scratch s;
  build_history(s);
  const auto r = verify(s.index());
  CHECK_MESSAGE(r.ok(), all(r));
  CHECK(r.documents > 300);
  CHECK(r.postings > 1000);
  int rc = -1;
  const std::string out = lode_run("verify --index '" + s.index() + "'", &rc);
  CHECK_MESSAGE(rc == 0, out);
  CHECK(out.find("sound") != std::string::npos);
}

TEST_CASE("verify: each kind of damage is named") {
  Scratch s;
  build_history(s);
  REQUIRE(verify(s.index()).ok());
  struct Damage {
    const char* what;
    const char* named;  // words the finding must hold
    std::string sql;
  };
  // The term most documents hold: its postings span several blocks.
  const std::string busiest = "(SELECT term_id FROM terms ORDER BY df DESC, term_id LIMIT 1)";
  const std::string busiest_seg = "(SELECT min(seg_id) FROM postings WHERE term_id = " + busiest + ")";
  const std::vector<Damage> cases = {
      {"a counter", "counter 'documents'", "UPDATE meta SET value = value + 5 WHERE key = 'documents'"},
      {"a df", "live postings give df", "UPDATE terms SET df = df + 1 WHERE term_id = " + busiest},
      {"a term the forward index names", "which the terms table does not hold",
       "DELETE FROM terms WHERE term_id = " + busiest},
      {"a packed block", "bad packed data",
       "UPDATE postings SET data = X'FF' || substr(data, 2) WHERE seg_id = " + busiest_seg},
      {"a segment header", "postings of term",
       "UPDATE postings SET head = X'00' WHERE seg_id = " + busiest_seg},
      {"positions", "positions of segment",
       "UPDATE positions SET data = substr(data, 1, length(data) - 1) WHERE seg_id = " + busiest_seg},
      {"a live flag", "norms say", "UPDATE docs SET live = 0 WHERE doc_id = (SELECT max(doc_id) FROM docs)"},
      {"stored text", "doc_text: document",
       "UPDATE doc_text SET body = X'07' WHERE doc_id = (SELECT max(doc_id) FROM doc_text)"},
      {"a forward row", "has no forward index",
       "DELETE FROM doc_terms WHERE doc_id = (SELECT max(doc_id) FROM doc_terms)"},
  };
  for (const Damage& d : cases) {
    const std::string what = d.what;
    CAPTURE(what);
    const std::string copy = s.other("copy.sqlite");
    std::filesystem::copy_file(s.index(), copy, std::filesystem::copy_options::overwrite_existing);
    sql_exec(copy, d.sql);
    const auto r = verify(copy);
    CHECK_FALSE(r.ok());
    CHECK_MESSAGE(names(r, d.named), all(r));
  }
}

TEST_CASE("verify: flipped pages fail lode verify with exit code 4 while stats still answers") {
  Scratch s;
  build_history(s);
  std::string bytes;
  {
    std::ifstream in(s.index(), std::ios::binary);
    bytes.assign(std::istreambuf_iterator<char>(in), {});
  }
  REQUIRE(bytes.size() > 16 * 4096);
  // Every second 4 KiB page of the file's second half, bytes inverted: the
  // header and meta pages at the front stay intact, as a bad sector leaves them.
  for (std::size_t page = bytes.size() / 4096 / 2; page < bytes.size() / 4096; page += 2)
    for (std::size_t i = page * 4096; i < (page + 1) * 4096; ++i) bytes[i] = static_cast<char>(~bytes[i]);
  { std::ofstream(s.index(), std::ios::binary | std::ios::trunc) << bytes; }
  int rc = -1;
  std::string out = lode_run("stats --index '" + s.index() + "'", &rc);
  CHECK_MESSAGE(rc == 0, out);  // damage a quick look does not see
  out = lode_run("verify --index '" + s.index() + "'", &rc);
  CHECK_MESSAGE(rc == 4, out);
  CHECK(out.find("damaged\tSQLite") != std::string::npos);
  CHECK(out.find("Rebuild it") != std::string::npos);
}

TEST_CASE("verify: a file that is not a database is damage, a missing file an error") {
  Scratch s;
  { std::ofstream(s.index(), std::ios::binary) << std::string(8192, 'x'); }
  const auto r = verify(s.index());
  CHECK_FALSE(r.ok());
  CHECK_MESSAGE(names(r, "SQLite"), all(r));
  auto missing = lode::verify_index(s.other("none.sqlite"));
  CHECK(missing.status().code() == lode::Code::kNotFound);
}

TEST_CASE("verify: a short norms row is damage to readers too, never documents read as dead") {
  Scratch s;
  build_history(s);
  sql_exec(s.index(), "UPDATE norms SET data = substr(data, 1, 120) WHERE chunk = 0");
  CHECK(names(verify(s.index()), "norms: chunk 0"));
  auto reader = lode::IndexReader::open(s.index());
  REQUIRE(reader.ok());
  auto scope = (*reader)->begin();
  REQUIRE(scope.ok());
  auto norms = (*reader)->norms();
  CHECK(norms.status().code() == lode::Code::kCorruption);
  CHECK(norms.status().message().find("norms chunk 0") != std::string::npos);
}
