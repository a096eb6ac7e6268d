// Incremental runs: edit, rename, delete and add between runs; the result
// must equal a fresh index of the same tree (statistics, stored documents,
// and ranked results), and a rename must not re-extract.
#include <doctest/doctest.h>

#include <map>
#include <vector>

#include "harness.h"
#include "ingest/stream_util.h"
#include "make_files.h"

namespace {

using namespace lode::testing;

struct Snapshot {
  lode::CollectionStats stats;
  std::map<std::string, std::string> docs;  // external id -> kind + "\x1f" + title + "\x1f" + body
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
      snap.docs[info->external_id] = info->kind + "\x1f" + *title + "\x1f" + *body;
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

TEST_CASE("a rename that changes how a file is read reads it again and equals a fresh index") {
  Scratch s;
  s.write("notes/signals.md", "# Fog signals\n\nthe *horn* sounded twice in the fog\n");
  s.write("notes/log.txt", "# not a heading\nthe lamp was trimmed at dusk\n");
  s.write("notes/tide.txt", "tide table for the week, high water at noon\n");
  s.write("notes/Keeper.TXT", "the keeper's log, written in capitals\n");
  const std::vector<std::string> queries = {"fog", "horn", "lamp", "heading", "tide", "keeper"};
  REQUIRE(index_tree(s.index(), {s.tree()}).added == 4);
  // Markdown to text, text to Markdown, text to a media name (skipped by a
  // fresh run), and a change of case only (read the same way: a move).
  std::filesystem::rename(s.file("notes/signals.md"), s.file("notes/signals.txt"));
  std::filesystem::rename(s.file("notes/log.txt"), s.file("notes/log.md"));
  std::filesystem::rename(s.file("notes/tide.txt"), s.file("notes/tide.png"));
  std::filesystem::rename(s.file("notes/Keeper.TXT"), s.file("notes/keeper.txt"));
  auto second = index_tree(s.index(), {s.tree()});
  CHECK(second.renamed == 1);
  const std::string fresh = s.other("fresh.sqlite");
  index_tree(fresh, {s.tree()});
  compare(snapshot(s.index(), queries), snapshot(fresh, queries));
  CHECK(hit_ids(search(s.index(), "tide")).empty());
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

namespace {

// A JSON Lines dump of `n` records; `version` changes some of them.
std::string records(int n, int version) {
  std::string out;
  for (int i = 0; i < n; ++i)
    out += "{\"id\": \"r" + std::to_string(i) + "\", \"title\": \"record " + std::to_string(i) +
           "\", \"text\": \"tide table entry " + std::to_string(i % 17) + " for the harbour" +
           (i % 5 == version % 5 ? " with a storm warning" : "") + "\"}\n";
  return out;
}

// Indexes the tree with JSON Lines files above `stream_above` bytes read in
// parts (0: none) and a writer committing every `batch_documents` documents.
lode::IndexReport index_parts(const std::string& index, const std::string& tree, std::int64_t stream_above,
                              std::size_t batch_documents) {
  lode::WriterOptions w;
  w.batch_documents = batch_documents;
  auto writer = lode::IndexWriter::open(index, std::nullopt, w);
  REQUIRE(writer.ok());
  lode::IndexRunOptions o;
  o.read.stream_jsonl_bytes = stream_above;
  o.stream_part_bytes = 64;
  auto r = lode::index_paths(**writer, {tree}, o);
  REQUIRE_MESSAGE(r.ok(), r.status().to_string());
  return *r;
}

}  // namespace

TEST_CASE("a JSON Lines file read in parts, committed mid-file, equals one read whole") {
  Scratch s;
  const std::string path = s.write("dump.jsonl", records(300, 0));
  s.write("note.txt", "a note on the harbour storm\n");
  const std::vector<std::string> queries = {"harbour", "storm warning", "\"tide table entry 3\"", "record"};
  const std::string whole = s.other("whole.sqlite");
  auto w = index_parts(whole, s.tree(), 0, 0);
  auto parts = index_parts(s.index(), s.tree(), 100, 7);  // parts of 64 bytes, commits every 7 records
  CHECK(parts.added == 2);
  CHECK(parts.documents == w.documents);
  CHECK(parts.bytes_read == w.bytes_read);
  CHECK(parts.by_kind.at("jsonl").documents == 300);
  compare(snapshot(s.index(), queries), snapshot(whole, queries));

  // Unchanged: nothing read; changed: read again in parts, equal to a fresh index.
  auto again = index_parts(s.index(), s.tree(), 100, 7);
  CHECK(again.unchanged == 2);
  CHECK(again.bytes_read == 0);
  s.write("dump.jsonl", records(250, 1));
  auto changed = index_parts(s.index(), s.tree(), 100, 7);
  CHECK(changed.updated == 1);
  const std::string fresh = s.other("fresh.sqlite");
  index_parts(fresh, s.tree(), 0, 0);
  compare(snapshot(s.index(), queries), snapshot(fresh, queries));

  // A run stopped mid-file (parts committed, the file never finished) is
  // read again by the next run, and nothing of the stopped run remains.
  {
    lode::WriterOptions wo;
    wo.batch_documents = 2;
    auto writer = lode::IndexWriter::open(s.index(), std::nullopt, wo);
    REQUIRE(writer.ok());
    auto held = (*writer)->file(path);
    REQUIRE(held.ok());
    REQUIRE(held->has_value());
    lode::FileRecord unfinished = **held;
    unfinished.size = -1;
    unfinished.hash.clear();
    REQUIRE((*writer)->begin_file(unfinished).ok());
    std::vector<lode::DocumentInput> part(5);
    for (std::size_t i = 0; i < part.size(); ++i) {
      part[i].external_id = "half" + std::to_string(i);
      part[i].body = "half read storm";
      part[i].kind = "jsonl";
    }
    REQUIRE((*writer)->add_documents(part).ok());
    CHECK((*writer)->finish_file(lode::FileRecord{s.file("other.jsonl"), s.tree(), 1, 1, "x", "jsonl"}).code() ==
          lode::Code::kInvalidArgument);
  }  // dropped without finish_file() or commit(): what the batches committed stays
  CHECK(search(s.index(), "half").matched >= 4);
  auto resumed = index_parts(s.index(), s.tree(), 100, 7);
  CHECK(resumed.updated == 1);
  CHECK(search(s.index(), "half").matched == 0);
  compare(snapshot(s.index(), queries), snapshot(fresh, queries));

  // Cancelled between parts: the parts read so far are committed, the file
  // is left unfinished, and the next run reads it again in full.
  s.write("dump.jsonl", records(300, 2));
  {
    lode::WriterOptions wo;
    wo.batch_documents = 7;
    auto writer = lode::IndexWriter::open(s.index(), std::nullopt, wo);
    REQUIRE(writer.ok());
    lode::IndexRunOptions o;
    o.read.stream_jsonl_bytes = 100;
    o.stream_part_bytes = 64;
    o.jobs = 1;
    int polls = 0;
    o.cancelled = [&] { return ++polls > 20; };
    auto r = lode::index_paths(**writer, {s.tree()}, o);
    REQUIRE(r.ok());
    CHECK(r->cancelled);
    CHECK(r->updated == 0);
  }
  auto held = lode::IndexReader::open(s.index());
  REQUIRE(held.ok());
  {
    auto scope = (*held)->begin();
    CHECK((*held)->stats().documents > 1);  // the note and the parts read before the stop
    CHECK((*held)->stats().documents < 300);
  }
  auto finished = index_parts(s.index(), s.tree(), 100, 7);
  CHECK(finished.updated == 1);
  const std::string fresh2 = s.other("fresh2.sqlite");
  index_parts(fresh2, s.tree(), 0, 0);
  compare(snapshot(s.index(), queries), snapshot(fresh2, queries));
}

TEST_CASE("the writer refuses parts of a file it has not begun") {
  Scratch s;
  auto writer = lode::IndexWriter::open(s.index(), std::nullopt);
  REQUIRE(writer.ok());
  CHECK((*writer)->add_documents({lode::DocumentInput{}}).code() == lode::Code::kInvalidArgument);
  CHECK((*writer)->finish_file(lode::FileRecord{s.file("a.jsonl"), s.tree(), 1, 1, "h", "jsonl"}).code() ==
        lode::Code::kInvalidArgument);
  REQUIRE((*writer)->put_file(lode::FileRecord{s.file("a.txt"), s.tree(), 1, 1, "h", "text"}, {}).ok());
  REQUIRE((*writer)->remove_file(s.file("a.txt")).ok());
  CHECK((*writer)->add_documents({}).code() == lode::Code::kInvalidArgument);  // the file is gone
}


TEST_CASE("a gzip-compressed JSON Lines file streams in parts like the plain one, members and damage included") {
  Scratch s;
  std::string text = "\xEF\xBB\xBF";
  for (int i = 0; i < 200; ++i)
    text += "{\"id\": \"g" + std::to_string(i % 190) + "\", \"text\": \"gauge reading " + std::to_string(i) +
            (i == 7 ? " bad \xFF byte" : "") + "\"}\n";
  text += "not json\n";
  // Two gzip members (as `cat a.gz b.gz` makes), cut inside a line.
  const std::size_t cut = text.size() / 2 + 5;
  const std::string packed = gzip_bytes(text.substr(0, cut)) + gzip_bytes(text.substr(cut));
  const std::string gz = s.write("dump.jsonl.gz", packed);
  auto whole = lode::read_file(gz, {});
  REQUIRE(whole.ok());
  REQUIRE(whole->documents.size() == 200);
  REQUIRE(whole->warnings.size() == 3);  // the bad byte, the bad line, repeated ids
  lode::ReadOptions o;
  o.stream_jsonl_bytes = 80;
  CHECK(lode::streams_as_jsonl(gz, static_cast<std::int64_t>(packed.size()), o));
  o.stream_jsonl_bytes = static_cast<std::int64_t>(packed.size()) * 8;
  CHECK_FALSE(lode::streams_as_jsonl(gz, static_cast<std::int64_t>(packed.size()), o));
  for (std::size_t slice : {std::size_t{5}, std::size_t{300}, std::size_t{1} << 20}) {
    CAPTURE(slice);
    const Streamed streamed = read_streamed(gz, slice);
    check_same_as_whole(streamed, *whole);
    CHECK(streamed.finish.size == static_cast<std::int64_t>(packed.size()));
  }

  // Indexed in parts, it equals the same file indexed whole.
  const std::string whole_index = s.other("whole.sqlite");
  index_parts(whole_index, s.tree(), 0, 0);
  auto parts = index_parts(s.index(), s.tree(), 80, 9);
  CHECK(parts.added == 1);
  CHECK(parts.documents == 200);
  compare(snapshot(s.index(), {"gauge", "reading 17"}), snapshot(whole_index, {"gauge", "reading 17"}));

  // Truncated gzip data fails the file with zlib's reason, as read_file does,
  // and leaves none of its parts in the index.
  s.write("dump.jsonl.gz", packed.substr(0, packed.size() - 30));
  auto cut_whole = lode::read_file(gz, {});
  REQUIRE_FALSE(cut_whole.ok());
  auto stream = lode::JsonlStream::open(gz, {});
  REQUIRE(stream.ok());
  const lode::Status failed = read_rest(**stream, 64).error;
  CHECK(failed.code() == lode::Code::kCorruption);
  CHECK(failed.message() == cut_whole.status().message());
  auto broken = index_parts(s.index(), s.tree(), 80, 9);
  CHECK(broken.failed == 1);
  CHECK(search(s.index(), "gauge").matched == 0);
}
