// Sifts saved in a real index file: restarts, re-indexing, changed and
// vanished documents, several sifts side by side, qrels export.
#include <sqlite3.h>

#include "lode/eval.h"
#include "lode/screening.h"
#include "screening/corpus.h"

using namespace lode;
using namespace lode::test;

namespace {

struct Opened {
  std::unique_ptr<IndexReader> reader;
  std::optional<IndexReader::ReadScope> scope;
  std::unique_ptr<SiftBook> book;
};
Opened open_sifts(const std::string& path, bool writable = true) {
  Opened o;
  auto r = IndexReader::open(path);
  REQUIRE_MESSAGE(r.ok(), r.status().to_string());
  o.reader = std::move(r.value());
  auto s = o.reader->begin();
  REQUIRE(s.ok());
  o.scope.emplace(std::move(s.value()));
  auto b = SiftBook::open(path, writable);
  REQUIRE_MESSAGE(b.ok(), b.status().to_string());
  o.book = std::move(b.value());
  return o;
}

// The index's own schema (every object but the review tables), to show a sift leaves it alone.
std::string index_schema(const std::string& path) {
  sqlite3* db = nullptr;
  REQUIRE(sqlite3_open_v2(path.c_str(), &db, SQLITE_OPEN_READONLY, nullptr) == SQLITE_OK);
  sqlite3_stmt* s = nullptr;
  sqlite3_prepare_v2(db, "SELECT name, sql FROM sqlite_master WHERE tbl_name NOT LIKE 'sift%' ORDER BY name", -1, &s, nullptr);
  std::string out;
  while (sqlite3_step(s) == SQLITE_ROW) {
    auto* sql = reinterpret_cast<const char*>(sqlite3_column_text(s, 1));
    out += std::string(reinterpret_cast<const char*>(sqlite3_column_text(s, 0))) + ":" + (sql ? sql : "") + "\n";
  }
  sqlite3_finalize(s);
  sqlite3_close(db);
  return out;
}

// Judges every pending document of the open (or next) batch from the truth: fog notes are d1..d12.
void judge_batch(Opened& o, const std::string& name, const std::string& reviewer) {
  auto b = o.book->next(*o.reader, name);
  REQUIRE_MESSAGE(b.ok(), b.status().to_string());
  std::vector<std::pair<std::string, bool>> js;
  for (auto& d : b->docs) js.emplace_back(d, std::stoul(d.substr(1)) <= kFogNotes);
  REQUIRE(o.book->mark(*o.reader, name, js, reviewer).ok());
}

}  // namespace

TEST_CASE("sift book: a review survives a restart and keeps who judged what, when, in which batch") {
  TempDir dir;
  std::string path = dir.str("i.sqlite");
  build_index(path, keeper_notes());
  std::string before = index_schema(path);
  {
    Opened o = open_sifts(path);
    REQUIRE(o.book->start(*o.reader, {"fog", "fog signal", {}, "ada", {}}).ok());
    for (int i = 0; i < 4; ++i) judge_batch(o, "fog", "ada");
  }
  CHECK(index_schema(path) == before);  // the index's own tables are untouched
  Opened o = open_sifts(path, false);
  auto st = o.book->state(*o.reader, "fog");
  REQUIRE_MESSAGE(st.ok(), st.status().to_string());
  // Batches of 1, 2, 3, 4 documents.
  CHECK(st->summary.batches == 4);
  CHECK(st->summary.judged == 10);
  CHECK(st->judgments.front().reviewer == "ada");
  CHECK(st->judgments.front().batch == 0);
  CHECK(st->judgments.back().batch == 3);
  CHECK(st->judgments.front().time_ns > 0);
  CHECK(st->unjudged == 50);
  CHECK(!st->open_batch);
  // The classifier finds the fog notes: most of the first ten are relevant.
  CHECK(st->summary.relevant >= 8);
  // Read-only: no writes.
  CHECK(o.book->next(*o.reader, "fog").status().code() == Code::kInvalidArgument);
}

TEST_CASE("sift book: re-indexing keeps judgments, changed text goes back to the pool, a removed document is kept as gone") {
  TempDir dir;
  std::string path = dir.str("i.sqlite");
  auto docs = keeper_notes();
  build_index(path, docs);
  {
    Opened o = open_sifts(path);
    REQUIRE(o.book->start(*o.reader, {"fog", "fog signal", {}, "ada", {}}).ok());
    REQUIRE(o.book->mark(*o.reader, "fog", {{"d1", true}, {"d2", true}, {"d30", false}}, "ada").ok());
  }
  {
    auto w = IndexWriter::open(path, std::nullopt);
    REQUIRE(w.ok());
    // d2 gets new text; d30 leaves; d1 is written again unchanged (new DocId, same text).
    REQUIRE((*w)->put_file({"/virtual/d2", "/virtual", 2, 2, "changed", "text"},
                           {doc_input("d2", "note 2", "tide gauge readings only")}).ok());
    REQUIRE((*w)->remove_file("/virtual/d30").ok());
    REQUIRE((*w)->put_file({"/virtual/d1", "/virtual", 1, 3, "again", "text"},
                           {doc_input("d1", docs[0].first, docs[0].second)}).ok());
    REQUIRE((*w)->commit().ok());
  }
  Opened o = open_sifts(path);
  auto st = o.book->state(*o.reader, "fog");
  REQUIRE(st.ok());
  std::map<std::string, std::string> state;
  for (auto& j : st->judgments) state[j.doc] = j.state;
  CHECK(state["d1"] == "current");
  CHECK(state["d2"] == "changed");
  CHECK(state["d30"] == "gone");
  CHECK(st->changed == 1);
  CHECK(st->gone == 1);
  CHECK(st->scope == 59);
  CHECK(st->unjudged == 58);  // only d1 still counts as judged
  // A judgment made again on the new text is current.
  REQUIRE(o.book->mark(*o.reader, "fog", {{"d2", false}}, "bo").ok());
  st = o.book->state(*o.reader, "fog");
  REQUIRE(st.ok());
  CHECK(st->changed == 0);
  CHECK(st->unjudged == 57);
}

TEST_CASE("sift book: two sifts side by side, @filters set the scope, qrels load in lode eval's reader") {
  TempDir dir;
  std::string path = dir.str("i.sqlite");
  build_index(path, keeper_notes());
  Opened o = open_sifts(path);
  REQUIRE(o.book->start(*o.reader, {"fog", "fog signal", {}, "ada", {}}).ok());
  REQUIRE(o.book->start(*o.reader, {"seals", "seal pups", {"d40"}, "bo", {}}).ok());
  REQUIRE(o.book->start(*o.reader, {"part", "fog @in:d1", {}, "bo", {}}).ok());
  CHECK(o.book->start(*o.reader, {"fog", "again", {}, "x", {}}).code() == Code::kInvalidArgument);
  CHECK(o.book->start(*o.reader, {"bad name", "fog", {}, "x", {}}).code() == Code::kInvalidArgument);
  CHECK(o.book->start(*o.reader, {"s2", "fog", {"nope"}, "x", {}}).code() == Code::kNotFound);
  judge_batch(o, "fog", "ada");
  REQUIRE(o.book->mark(*o.reader, "seals", {{"d41", false}}, "bo").ok());
  auto list = o.book->list();
  REQUIRE(list.ok());
  REQUIRE(list->size() == 3);
  auto fog = o.book->state(*o.reader, "fog");
  auto seals = o.book->state(*o.reader, "seals");
  auto part = o.book->state(*o.reader, "part");
  REQUIRE((fog.ok() && seals.ok() && part.ok()));
  CHECK(fog->summary.judged == 1);
  CHECK(seals->summary.judged == 2);  // the seed and d41
  CHECK(seals->judgments[0].batch == -1);
  // "@in:d1" keeps ids starting with d1: d1, d10..d19.
  CHECK(part->scope == 11);
  auto q = o.book->qrels("seals", "7");
  REQUIRE(q.ok());
  auto parsed = parse_qrels(*q, "export");
  REQUIRE_MESSAGE(parsed.ok(), parsed.status().to_string());
  CHECK((*parsed)["7"]["d40"] == 1);
  CHECK((*parsed)["7"]["d41"] == 0);
  // Marking an unknown document writes nothing.
  CHECK(o.book->mark(*o.reader, "seals", {{"d42", true}, {"nope", true}}, "bo").code() == Code::kNotFound);
  CHECK(o.book->state(*o.reader, "seals")->summary.judged == 2);
  REQUIRE(o.book->drop("part").ok());
  CHECK(o.book->list()->size() == 2);
}

TEST_CASE("sift book: a check sample gives a recall estimate, and a run of the fog review stops by the knee rule") {
  TempDir dir;
  std::string path = dir.str("i.sqlite");
  build_index(path, keeper_notes());
  Opened o = open_sifts(path);
  REQUIRE(o.book->start(*o.reader, {"fog", "fog signal", {}, "ada", {}}).ok());
  for (int i = 0; i < 5; ++i) judge_batch(o, "fog", "ada");
  auto st = o.book->state(*o.reader, "fog");
  REQUIRE(st.ok());
  CHECK_FALSE(st->recall.known);
  auto check = o.book->check_sample(*o.reader, "fog", 20);
  REQUIRE(check.ok());
  CHECK(check->check);
  CHECK(check->docs.size() == 20);
  CHECK(check->remainder == 60 - 15);
  std::vector<std::pair<std::string, bool>> js;
  for (auto& d : check->docs) js.emplace_back(d, std::stoul(d.substr(1)) <= kFogNotes);
  REQUIRE(o.book->mark(*o.reader, "fog", js, "ada").ok());
  st = o.book->state(*o.reader, "fog");
  REQUIRE(st.ok());
  REQUIRE(st->recall.known);
  CHECK(st->recall.low <= st->recall.value);
  CHECK(st->recall.value <= st->recall.high);
  // Check-sample judgments are not part of the knee curve.
  CHECK(st->knee.reviewed == 15);
}
