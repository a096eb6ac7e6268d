// Incremental runs: edit, rename, delete and add between runs; the result
// must equal a fresh index of the same tree (statistics, stored documents,
// and ranked results), and a rename must not re-extract.
#include <doctest/doctest.h>

#include <map>

#include "harness.h"
#include "make_files.h"

namespace {

using namespace lode::testing;

struct Snapshot {
  lode::CollectionStats stats;
  std::map<std::string, std::string> docs;  // external id -> title + "\x1f" + body
  std::map<std::string, std::vector<std::pair<std::string, double>>> results;
};

Snapshot snapshot(const std::string& index, const std::vector<std::string>& queries) {
  Snapshot snap;
  auto reader = lode::IndexReader::open(index);
  REQUIRE(reader.ok());
  {
    auto scope = (*reader)->begin();
    REQUIRE(scope.ok());
    snap.stats = (*reader)->stats();
    for (lode::DocId d = 1; d < (*reader)->doc_id_limit(); ++d) {
      if (!(*reader)->live(d)) continue;
      auto info = (*reader)->document(d);
      REQUIRE(info.ok());
      auto title = (*reader)->stored_text(d, lode::Field::kTitle);
      auto body = (*reader)->stored_text(d, lode::Field::kBody);
      REQUIRE(body.ok());
      snap.docs[info->external_id] = *title + "\x1f" + *body;
    }
  }
  for (auto& q : queries)
    for (auto& h : search(index, q).hits) snap.results[q].emplace_back(h.external_id, h.score);
  return snap;
}

void compare(const Snapshot& a, const Snapshot& b) {
  CHECK(a.stats.documents == b.stats.documents);
  CHECK(a.stats.files == b.stats.files);
  CHECK(a.stats.terms == b.stats.terms);
  CHECK(a.stats.postings == b.stats.postings);
  CHECK(a.stats.total_length == b.stats.total_length);
  CHECK(a.docs == b.docs);
  REQUIRE(a.results.size() == b.results.size());
  for (auto& [q, hits] : a.results) {
    CAPTURE(q);
    const auto& other = b.results.at(q);
    REQUIRE(hits.size() == other.size());
    for (std::size_t i = 0; i < hits.size(); ++i) {
      CHECK(hits[i].first == other[i].first);
      CHECK(hits[i].second == doctest::Approx(other[i].second).epsilon(1e-12));
    }
  }
}

TEST_CASE("edit, rename, delete and add between runs equal a fresh index") {
  Scratch s;
  s.write("notes/a.txt", "lighthouse keeper log\nthe lamp was trimmed at dusk\n");
  s.write("notes/b.md", "# Fog signals\nthe horn sounded twice in the fog\n");
  s.write("web/c.html", "<title>Harbour</title><p>boats in the harbour at dawn</p>");
  s.write("papers/d.pdf", make_pdf({"survey of the reef", "the lamp on the reef"}, "Reef Survey"));
  s.write("old/e.txt", "a file that will be deleted, about the lamp\n");
  const std::vector<std::string> queries = {"lamp", "reef", "harbour dawn", "fog horn", "keeper", "\"the lamp\""};
  auto first = index_tree(s.index(), {s.tree()});
  REQUIRE(first.added == 5);

  // Between runs: edit a, rename the PDF (content unchanged), delete e, add f.
  s.write("notes/a.txt", "lighthouse keeper log\nthe lamp was cleaned and trimmed at dusk\n");
  std::filesystem::create_directories(s.file("archive"));
  std::filesystem::rename(s.file("papers/d.pdf"), s.file("archive/reef.pdf"));
  std::filesystem::remove(s.file("old/e.txt"));
  s.write("new/f.txt", "a new note about the lamp and the reef\n");
  auto second = index_tree(s.index(), {s.tree()});
  CHECK(second.updated == 1);
  CHECK(second.renamed == 1);
  CHECK(second.removed == 1);
  CHECK(second.added == 1);  // the renamed PDF was not read again
  CHECK(second.by_kind.count("pdf") == 0);

  const std::string fresh = s.other("fresh.sqlite");
  index_tree(fresh, {s.tree()});
  compare(snapshot(s.index(), queries), snapshot(fresh, queries));
  // The renamed document answers under its new id.
  CHECK(hit_ids(search(s.index(), "survey")) == std::vector<std::string>{"archive/reef.pdf"});
}

TEST_CASE("a run with nothing changed reads nothing") {
  Scratch s;
  for (int i = 0; i < 20; ++i) s.write("f" + std::to_string(i) + ".txt", "note number " + std::to_string(i) + "\n");
  index_tree(s.index(), {s.tree()});
  auto again = index_tree(s.index(), {s.tree()});
  CHECK(again.unchanged == 20);
  CHECK(again.bytes_read == 0);
  CHECK(again.added + again.updated + again.removed + again.renamed == 0);
}

TEST_CASE("parallel extraction gives the same index as one thread") {
  Scratch s;
  for (int i = 0; i < 40; ++i)
    s.write("d" + std::to_string(i % 4) + "/f" + std::to_string(i) + (i % 3 == 0 ? ".html" : ".txt"),
            (i % 3 == 0 ? "<p>" : "") + std::string("shared words and unique") + std::to_string(i) + " token\n");
  lode::IndexRunOptions one, many;
  one.jobs = 1;
  many.jobs = 4;
  many.read_ahead = 3;
  const std::string other = s.other("one.sqlite");
  index_tree(s.index(), {s.tree()}, many);
  index_tree(other, {s.tree()}, one);
  const std::vector<std::string> queries = {"shared", "unique7 token", "words"};
  compare(snapshot(s.index(), queries), snapshot(other, queries));
  // A read-ahead budget of one byte: one finished file waits at a time, and
  // the run neither stalls nor changes.
  lode::IndexRunOptions tight = many;
  tight.read_ahead_bytes = 1;
  const std::string third = s.other("tight.sqlite");
  index_tree(third, {s.tree()}, tight);
  compare(snapshot(third, queries), snapshot(other, queries));
  // Doc ids follow the crawl order whatever the thread count.
  auto a = lode::IndexReader::open(s.index());
  auto b = lode::IndexReader::open(other);
  auto sa = (*a)->begin();
  auto sb = (*b)->begin();
  for (lode::DocId d = 1; d < (*a)->doc_id_limit(); ++d) CHECK((*a)->document(d)->external_id == (*b)->document(d)->external_id);
}

TEST_CASE("cancelling commits what is done and a later run finishes the job") {
  Scratch s;
  for (int i = 0; i < 10; ++i) s.write("f" + std::to_string(i) + ".txt", "word" + std::to_string(i) + " common\n");
  lode::IndexRunOptions options;
  int polls = 0;
  options.cancelled = [&] { return ++polls > 4; };
  auto r = index_tree(s.index(), {s.tree()}, options);
  CHECK(r.cancelled);
  CHECK(r.added == 4);
  CHECK(search(s.index(), "common").hits.size() == 4);
  auto rest = index_tree(s.index(), {s.tree()});
  CHECK(rest.added == 6);
  CHECK(rest.unchanged == 4);
  CHECK(search(s.index(), "common").matched == 10);
}

}  // namespace
