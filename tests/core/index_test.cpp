// Index writer/reader behaviour: incremental updates equal a fresh build,
// exact statistics, bad files, a second writer, crashes and snapshots.
#include <sys/wait.h>
#include <unistd.h>

#include "index/codec.h"
#include "index/bitpack.h"
#include "index/segment.h"
#include "index/sqlite.h"
#include "lode/indexer.h"
#include "util.h"

using namespace lode;
using namespace lode::test;

namespace {

IndexReport index_tree(const std::string& index, const std::string& root, WriterOptions wo = {}) {
  auto w = IndexWriter::open(index, IndexSettings{}, wo);
  REQUIRE_MESSAGE(w.ok(), w.status().to_string());
  auto rep = index_paths(**w, {root}, IndexRunOptions{});
  REQUIRE_MESSAGE(rep.ok(), rep.status().to_string());
  return *rep;
}

// Everything observable about an index that must not depend on its history.
struct Snapshot {
  CollectionStats stats;
  std::map<std::string, std::pair<std::uint64_t, std::uint64_t>> df_cf;  // field/term -> df, cf
  std::map<std::string, std::map<std::string, double>> scores;          // query -> id -> score
};

Snapshot snapshot_of(const std::string& index, const std::vector<std::string>& vocabulary) {
  Snapshot s;
  auto reader = IndexReader::open(index);
  REQUIRE(reader.ok());
  {
    auto scope = (*reader)->begin();
    REQUIRE(scope.ok());
    s.stats = (*reader)->stats();
    for (auto& word : vocabulary)
      for (Field f : kAllFields) {
        auto t = (*reader)->term(f, word);
        REQUIRE(t.ok());
        if (t->has_value() && (*t)->df > 0)
          s.df_cf[std::string(field_name(f)) + "/" + word] = {(*t)->df, (*t)->cf};
      }
  }
  for (auto& q : {"storm kelp", "lamp oil wick", "\"north quay\"", "seal -storm", "+tide gauge"}) {
    for (Model m : {Model::kBm25, Model::kTfIdf}) {
      SearchOptions o;
      o.model = m;
      s.scores[std::string(q) + "/" + std::string(model_name(m))] = scores_of(**reader, q, o);
    }
  }
  return s;
}

void check_same(const Snapshot& a, const Snapshot& b) {
  CHECK(a.stats.documents == b.stats.documents);
  CHECK(a.stats.total_length == b.stats.total_length);
  CHECK(a.stats.terms == b.stats.terms);
  CHECK(a.stats.postings == b.stats.postings);
  CHECK(a.stats.files == b.stats.files);
  CHECK(a.df_cf == b.df_cf);
  REQUIRE(a.scores.size() == b.scores.size());
  for (auto& [q, sa] : a.scores) {
    CAPTURE(q);
    const auto& sb = b.scores.at(q);
    REQUIRE(sa.size() == sb.size());
    for (auto& [id, score] : sa) {
      CAPTURE(id);
      REQUIRE(sb.count(id) == 1);
      CHECK(std::abs(score - sb.at(id)) < 1e-12);
    }
  }
}

const std::vector<std::string> kVocabulary = {"storm", "kelp", "lamp", "oil", "wick", "north", "quay",
                                              "seal", "tide", "gaug", "keeper", "surg"};

}  // namespace

TEST_CASE("edit, delete and add between runs: the index equals a fresh build of the same tree") {
  TempDir dir;
  auto tree = dir.path() / "tree";
  write_file(tree / "a.txt", "Storm log\nthe storm surge reached the north quay at dawn");
  write_file(tree / "b.md", "# Kelp survey\n\nKelp beds after the **storm**; seals on the skerry.");
  write_file(tree / "c.txt", "Lamp notes\nlamp oil and a new wick for the lamp");
  write_file(tree / "sub/d.jsonl",
             "{\"id\":\"r1\",\"title\":\"Tide gauge\",\"text\":\"tide gauge read at noon\"}\n"
             "{\"id\":\"r2\",\"title\":\"Seal count\",\"text\":\"seal pups on the north skerry\"}\n");
  std::string inc = dir.str("inc.sqlite");
  // Small batches so the run commits several times and refills partial blocks.
  WriterOptions small;
  small.batch_documents = 2;
  auto first = index_tree(inc, tree.string(), small);
  CHECK(first.added == 4);
  CHECK(first.documents == 5);

  auto again = index_tree(inc, tree.string(), small);
  CHECK(again.unchanged == 4);
  CHECK(again.added + again.updated + again.removed == 0);

  write_file(tree / "a.txt", "Storm log\nno storm today; the keeper oiled the lamp");  // edit
  fs::remove(tree / "c.txt");                                                          // delete
  write_file(tree / "e.txt", "Quay repairs\nstones reset on the north quay after the storm surge");  // add
  write_file(tree / "sub/d.jsonl",
             "{\"id\":\"r1\",\"title\":\"Tide gauge\",\"text\":\"tide gauge read at noon and dusk\"}\n");
  auto third = index_tree(inc, tree.string(), small);
  CHECK(third.added == 1);
  CHECK(third.updated == 2);
  CHECK(third.removed == 1);

  std::string fresh = dir.str("fresh.sqlite");
  index_tree(fresh, tree.string());
  auto a = snapshot_of(inc, kVocabulary);
  auto b = snapshot_of(fresh, kVocabulary);
  CHECK(a.stats.documents == 4);
  CHECK(a.stats.dead_documents >= 3);
  check_same(a, b);
}

TEST_CASE("small commits keep segments dense, large commits append segments, and both rank the same") {
  // 600 documents that all hold "storm", committed 50 at a time.
  std::vector<std::pair<std::string, std::string>> docs;
  for (int i = 0; i < 600; ++i) docs.emplace_back("", "storm log entry " + std::to_string(i % 7) + " lamp");
  TempDir dir;
  auto blocks_of = [](const std::string& path, const char* term) {
    auto db = sql::Db::open(path, SQLITE_OPEN_READONLY);
    REQUIRE(db.ok());
    auto q = db->prepare(
        "SELECT count(*), sum(count), max(count) FROM postings WHERE term_id = "
        "(SELECT term_id FROM terms WHERE field = 1 AND term = ?)");
    REQUIRE(q.ok());
    q->bind(1, std::string(term));
    REQUIRE(q->step());
    return std::array<std::int64_t, 3>{q->i64(0), q->i64(1), q->i64(2)};
  };
  WriterOptions every50;
  every50.batch_documents = 50;  // 12 commits of a few terms each: under refill_max_terms
  const std::string dense = dir.str("dense.sqlite");
  build_index(dense, docs, {}, every50);
  // Refilled while under 512 postings: one segment of 550, then one of 50.
  CHECK(blocks_of(dense, "storm") == std::array<std::int64_t, 3>{2, 600, 550});
  WriterOptions appending = every50;
  appending.refill_max_terms = 0;  // as a commit of many terms does
  const std::string appended = dir.str("appended.sqlite");
  build_index(appended, docs, {}, appending);
  CHECK(blocks_of(appended, "storm") == std::array<std::int64_t, 3>{12, 600, 50});
  check_same(snapshot_of(dense, kVocabulary), snapshot_of(appended, kVocabulary));
  for (const char* q : {"storm", "\"storm log\"", "lamp +storm"}) {
    auto a = open_index(dense);
    auto b = open_index(appended);
    SearchOptions o;
    o.top = 1000;
    auto ra = a.searcher->search(q, o);
    auto rb = b.searcher->search(q, o);
    REQUIRE(ra.ok());
    REQUIRE(rb.ok());
    CHECK(ra->matched == 600);
    REQUIRE(ra->hits.size() == rb->hits.size());
    for (std::size_t i = 0; i < ra->hits.size(); ++i) CHECK(ra->hits[i].doc == rb->hits[i].doc);
  }
}

TEST_CASE("many updates of one file keep df, cf and lengths exact") {
  TempDir dir;
  std::string index = dir.str("i.sqlite");
  auto w = IndexWriter::open(index, IndexSettings{AnalyzerOptions{"none", false}});
  REQUIRE(w.ok());
  for (int round = 0; round < 300; ++round) {
    FileRecord f{"/v/x", "/v", round, round, "h" + std::to_string(round), "text"};
    std::string body = "alpha beta";
    for (int i = 0; i < round % 7; ++i) body += " gamma";
    REQUIRE((*w)->put_file(f, {doc_input("x", "", body)}).ok());
    FileRecord g{"/v/y" + std::to_string(round), "/v", 1, 1, "g", "text"};
    REQUIRE((*w)->put_file(g, {doc_input("y", "", "alpha")}).ok());
    if (round % 50 == 0) REQUIRE((*w)->commit().ok());
  }
  REQUIRE((*w)->commit().ok());
  auto st = (*w)->stats();
  CHECK(st.documents == 301);
  CHECK(st.total_length[1] == 2 + 299 % 7 + 300);
  auto r = IndexReader::open(index);
  REQUIRE(r.ok());
  auto scope = (*r)->begin();
  REQUIRE(scope.ok());
  auto alpha = (*r)->term(Field::kBody, "alpha");
  REQUIRE(alpha.ok());
  CHECK((*alpha)->df == 301);
  CHECK((*alpha)->cf == 301);
  auto gamma = (*r)->term(Field::kBody, "gamma");
  CHECK((*gamma)->df == 1);
  CHECK((*gamma)->cf == 299 % 7);
  // Every posting the cursor yields for a live doc is counted exactly once.
  auto c = (*r)->postings(**alpha);
  std::uint64_t live = 0;
  DocId prev = 0;
  for (; c->valid(); c->next()) {
    CHECK(c->doc() > prev);
    prev = c->doc();
    live += (*r)->live(c->doc());
  }
  CHECK(c->status().ok());
  CHECK(live == 301);
}

TEST_CASE("bad files are reported and lose nothing already indexed") {
  TempDir dir;
  auto tree = dir.path() / "t";
  write_file(tree / "good.txt", "Good\nthe lighthouse keeper wrote daily");
  std::string index = dir.str("i.sqlite");
  index_tree(index, tree.string());

  write_file(tree / "bad-utf8.txt", std::string("Broken\nkelp \xff\xfe harvest \xc3"));
  write_file(tree / "empty.txt", "");
  write_file(tree / "binary.dat", std::string("\x00\x01\x02\x03 binary", 11));
  write_file(tree / "vanish.txt", "Soon gone\nephemeral words");
  auto w = IndexWriter::open(index, std::nullopt);
  REQUIRE(w.ok());
  auto rep = index_paths(**w, {tree.string()}, IndexRunOptions{}, [&](const IndexProgress& p) {
    if (p.current.find("vanish.txt") != std::string_view::npos) fs::remove(tree / "vanish.txt");
  });
  REQUIRE(rep.ok());
  bool named_binary = false, named_vanish = false, named_utf8 = false;
  for (auto& p : rep->problems) {
    named_binary |= p.path.find("binary.dat") != std::string::npos;
    named_vanish |= p.path.find("vanish.txt") != std::string::npos;
  }
  for (auto& p : rep->warnings) named_utf8 |= p.path.find("bad-utf8.txt") != std::string::npos;
  CHECK_FALSE(named_binary);  // binary data is skipped, not a failure
  CHECK(rep->skipped == 1);
  CHECK(named_vanish);
  CHECK(named_utf8);
  CHECK(rep->failed == 1);
  w->reset();

  auto reader = IndexReader::open(index);
  REQUIRE(reader.ok());
  CHECK(scores_of(**reader, "lighthouse", {}).count("good.txt") == 1);  // still there
  CHECK(scores_of(**reader, "harvest", {}).count("bad-utf8.txt") == 1); // repaired and indexed
  CHECK(scores_of(**reader, "ephemeral", {}).empty());
}

TEST_CASE("binary and media files are skipped, counted, and not read again while unchanged") {
  TempDir dir;
  auto tree = dir.path() / "t";
  write_file(tree / "good.txt", "Good\nthe lighthouse keeper wrote daily");
  write_file(tree / "tower.png", "not even a real PNG: the extension decides");
  // A PNG signature under a text name: the content decides.
  const std::string png = std::string("\x89PNG\r\n\x1a\n", 8) + "pixels pixels";
  write_file(tree / "scan.txt", png);
  std::string index = dir.str("i.sqlite");
  auto run = [&] {
    auto w = IndexWriter::open(index, IndexSettings{});
    REQUIRE(w.ok());
    auto rep = index_paths(**w, {tree.string()}, IndexRunOptions{});
    REQUIRE(rep.ok());
    return std::move(rep.value());
  };
  IndexReport first = run();
  CHECK(first.skipped == 2);
  CHECK(first.failed == 0);
  CHECK(first.problems.empty());
  CHECK(first.added == 1);

  // Same size, same mtime, new text: an unchanged file is not read again, so
  // the words never reach the index.
  const auto mtime = fs::last_write_time(tree / "scan.txt");
  write_file(tree / "scan.txt", "kittiwakes" + std::string(png.size() - 10, ' '));
  fs::last_write_time(tree / "scan.txt", mtime);
  IndexReport second = run();
  CHECK(second.skipped == 2);
  CHECK(second.unchanged == 1);
  CHECK(second.added + second.updated == 0);
  {
    auto reader = IndexReader::open(index);
    REQUIRE(reader.ok());
    CHECK(scores_of(**reader, "kittiwakes", {}).empty());
  }
  // Once it changes (new mtime), it is read again and now holds text.
  fs::last_write_time(tree / "scan.txt", mtime + std::chrono::seconds(5));
  IndexReport third = run();
  CHECK(third.skipped == 1);
  CHECK(third.updated == 1);
  auto reader = IndexReader::open(index);
  REQUIRE(reader.ok());
  CHECK(scores_of(**reader, "kittiwakes", {}).count("scan.txt") == 1);
}

TEST_CASE("a second writer is refused with a message naming the holder") {
  TempDir dir;
  std::string index = dir.str("i.sqlite");
  auto first = IndexWriter::open(index, IndexSettings{});
  REQUIRE(first.ok());
  auto second = IndexWriter::open(index, IndexSettings{});
  REQUIRE_FALSE(second.ok());
  CHECK(second.status().code() == Code::kBusy);
  CHECK(second.status().message().find(std::to_string(::getpid())) != std::string::npos);
  first.value().reset();
  CHECK(IndexWriter::open(index, std::nullopt).ok());  // released with the first writer
}

TEST_CASE("a process killed mid-batch leaves the last committed index intact") {
  TempDir dir;
  std::string index = dir.str("i.sqlite");
  build_index(index, {{"Committed", "safe words in a committed document"}});
  pid_t child = fork();
  REQUIRE(child >= 0);
  if (child == 0) {
    auto w = IndexWriter::open(index, std::nullopt);
    if (!w.ok()) _exit(2);
    for (int i = 0; i < 50; ++i) {
      FileRecord f{"/v/new" + std::to_string(i), "/v", 1, 1, "h", "text"};
      if (!(*w)->put_file(f, {doc_input("n", "Uncommitted", "lost words")}).ok()) _exit(3);
    }
    _exit(0);  // no commit, no destructors: as abrupt as a crash
  }
  int status = 0;
  waitpid(child, &status, 0);
  REQUIRE(WIFEXITED(status));
  CHECK(WEXITSTATUS(status) == 0);
  auto reader = IndexReader::open(index);
  REQUIRE(reader.ok());
  {
    auto scope = (*reader)->begin();
    CHECK((*reader)->stats().documents == 1);
  }
  CHECK(scores_of(**reader, "lost", {}).empty());
  CHECK(scores_of(**reader, "safe", {}).size() == 1);
  CHECK(IndexWriter::open(index, std::nullopt).ok());  // the dead writer's lock is gone
}

TEST_CASE("a reader's scope is one snapshot while a writer commits") {
  TempDir dir;
  std::string index = dir.str("i.sqlite");
  build_index(index, {{"One", "first document"}});
  auto reader = IndexReader::open(index);
  REQUIRE(reader.ok());
  std::uint64_t generation = 0;
  {
    auto scope = (*reader)->begin();
    REQUIRE(scope.ok());
    CHECK((*reader)->stats().documents == 1);
    generation = (*reader)->stats().generation;
    CHECK(generation >= 1);
    auto w = IndexWriter::open(index, std::nullopt);
    REQUIRE(w.ok());
    REQUIRE((*w)->put_file(FileRecord{"/v/2", "/v", 1, 1, "h", "text"}, {doc_input("2", "Two", "second")}).ok());
    REQUIRE((*w)->commit().ok());
    CHECK((*reader)->stats().documents == 1);
    auto t = (*reader)->term(Field::kBody, "second");
    REQUIRE(t.ok());
    CHECK(!t->has_value());
    CHECK((*reader)->stats().generation == generation);  // the snapshot's, not the writer's
  }
  auto scope = (*reader)->begin();
  CHECK((*reader)->stats().documents == 2);
  CHECK((*reader)->stats().generation == generation + 1);  // one commit later
}

TEST_CASE("analyzer settings are fixed at creation") {
  TempDir dir;
  std::string index = dir.str("i.sqlite");
  build_index(index, {{"", "running runners ran"}}, AnalyzerOptions{"none", true});
  auto w = IndexWriter::open(index, IndexSettings{AnalyzerOptions{"english", true}});
  REQUIRE_FALSE(w.ok());
  CHECK(w.status().message().find("none") != std::string::npos);
  auto r = IndexReader::open(index);
  REQUIRE(r.ok());
  CHECK((*r)->settings().analyzer.language == "none");
  CHECK(scores_of(**r, "running", {}).size() == 1);
  CHECK(scores_of(**r, "run", {}).empty());  // not stemmed: recorded settings apply to queries
}

TEST_CASE("decoders reject corrupt blobs with a Corruption status") {
  // The worked example in docs/index-format.md: docs 10, 12, 30 with tf 1, 4, 2
  // and field lengths 5, 9, 7.
  codec::SegmentBuilder builder;
  builder.add(10, 1, 5, std::string("\x03", 1));
  builder.add(12, 4, 9, std::string("\x00\x02\x03\x04", 4));
  builder.add(30, 2, 7, std::string("\x01\x01", 2));
  const codec::BuiltSegment seg = builder.finish();
  CHECK(seg.data == std::string("\x05\x02\x20\x44\x1c", 5));
  CHECK(seg.head == std::string("\x01\x03\x14\x05\x07\x03\x01\x05\x02\x07\x04\x09", 12));
  auto stored = [&](std::string head, std::string data, std::uint32_t count = 3) {
    return std::vector<PostingList::StoredSegment>{{1, seg.first_doc, seg.last_doc, count, head, data}};
  };
  auto list = PostingList::build(stored(seg.head, seg.data), "term 1");
  REQUIRE(list.ok());
  DocId docs[kBlockSize];
  std::uint32_t tfs[kBlockSize];
  REQUIRE((*list)->decode(0, docs, tfs).ok());
  CHECK(std::vector<DocId>(docs, docs + 3) == std::vector<DocId>{10, 12, 30});
  CHECK(std::vector<std::uint32_t>(tfs, tfs + 3) == std::vector<std::uint32_t>{1, 4, 2});
  const auto pts = (*list)->points((*list)->blocks()[0]);
  CHECK(std::vector<BoundPoint>(pts.begin(), pts.end()) == std::vector<BoundPoint>{{1, 5}, {2, 7}, {4, 9}});
  for (std::size_t cut = 0; cut < seg.head.size(); ++cut)
    CHECK(PostingList::build(stored(seg.head.substr(0, cut), seg.data), "t").status().code() == Code::kCorruption);
  CHECK(PostingList::build(stored(seg.head + "x", seg.data), "t").status().code() == Code::kCorruption);
  CHECK(PostingList::build(stored(seg.head, seg.data + "x"), "t").status().code() == Code::kCorruption);
  CHECK(PostingList::build(stored(seg.head, seg.data, 4), "t").status().code() == Code::kCorruption);
  std::string flipped = seg.data;
  flipped[3] = '\x45';  // the third gap grows: the block no longer ends at doc 30
  auto bad = PostingList::build(stored(seg.head, flipped), "t");
  REQUIRE(bad.ok());
  CHECK((*bad)->decode(0, docs, tfs).code() == Code::kCorruption);
  flipped = seg.data;
  flipped[0] = '\x40';  // a 64-bit width
  bad = PostingList::build(stored(seg.head, flipped), "t");
  REQUIRE(bad.ok());
  CHECK((*bad)->decode(0, docs, tfs).code() == Code::kCorruption);
  std::vector<codec::ForwardList> fwd{{{3, 1}, {9, 2}}, {{4, 7}}};
  std::string f = codec::encode_forward(fwd);
  std::vector<codec::ForwardList> back;
  CHECK(codec::decode_forward(f, back).ok());
  CHECK(back == fwd);
  CHECK(codec::decode_forward(f.substr(0, f.size() - 1), back).code() == Code::kCorruption);
  CHECK(codec::decompress_text("\x07zz").status().code() == Code::kCorruption);
  std::string big(5000, 'k');
  auto round = codec::decompress_text(codec::compress_text(big));
  REQUIRE(round.ok());
  CHECK(*round == big);
}

TEST_CASE("bit packing round-trips every width and block size, reading nothing past the packed bytes") {
  std::uint64_t state = 12345;
  auto next = [&]() {  // splitmix64: any fixed sequence will do
    state += 0x9e3779b97f4a7c15ull;
    std::uint64_t z = state;
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ull;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebull;
    return z ^ (z >> 31);
  };
  for (unsigned width = 0; width <= codec::kMaxPackWidth; ++width)
    for (std::size_t n : {1, 2, 7, 9, 64, 127, 128}) {
      std::vector<std::uint32_t> values(n);
      for (auto& v : values) v = width == 0 ? 0 : static_cast<std::uint32_t>(next() & ((std::uint64_t{1} << width) - 1));
      std::string packed;
      codec::pack(packed, values.data(), n, width);
      REQUIRE(packed.size() == codec::packed_bytes(n, width));
      // A copy of exactly that size: a read past it would show under ASan.
      std::vector<unsigned char> exact(packed.begin(), packed.end());
      std::vector<std::uint32_t> back(n, 0xdeadbeef);
      codec::unpack(exact.data(), exact.size(), back.data(), n, width);
      CHECK_MESSAGE(back == values, "width " << width << ", n " << n);
    }
}

TEST_CASE("readers sharing a cache reuse decoded postings and see the next commit, never a stale list") {
  TempDir dir;
  const std::string index = dir.str("i.sqlite");
  build_index(index, {{"One", "beacon lamp"}, {"Two", "beacon fog"}});
  auto cache = std::make_shared<ReaderCache>();
  auto a = IndexReader::open(index, ReaderOptions{cache});
  auto b = IndexReader::open(index, ReaderOptions{cache});
  REQUIRE(a.ok());
  REQUIRE(b.ok());
  auto docs_of = [](IndexReader& r, const char* word) {
    auto scope = r.begin();
    REQUIRE(scope.ok());
    auto t = r.term(Field::kBody, word);
    REQUIRE(t.ok());
    REQUIRE(t->has_value());
    std::vector<DocId> out;
    for (auto c = r.postings(**t); c->valid(); c->next()) out.push_back(c->doc());
    auto n = r.norms();
    REQUIRE(n.ok());
    for (DocId d : out) CHECK((*n)->live(d));
    return out;
  };
  CHECK(docs_of(**a, "beacon").size() == 2);
  const auto misses = cache->counts().misses;
  CHECK(docs_of(**b, "beacon").size() == 2);  // the list decoded for `a` serves `b`
  CHECK(cache->counts().hits >= 1);
  CHECK(cache->counts().misses == misses);
  {
    auto w = IndexWriter::open(index, std::nullopt);
    REQUIRE(w.ok());
    REQUIRE((*w)->put_file(FileRecord{"/v/3", "/v", 1, 1, "h3", "text"}, {doc_input("3", "Three", "beacon tide")}).ok());
    REQUIRE((*w)->commit().ok());
  }
  CHECK(docs_of(**b, "beacon").size() == 3);  // a new generation: the cached list is not used
  CHECK(docs_of(**a, "beacon").size() == 3);
}

TEST_CASE("documents added in one large call index exactly as when added one by one") {
  // add_documents() analyzes and compresses the next part of a large call on
  // a second thread while it writes the current one: part boundaries (256
  // documents) must change nothing.
  std::vector<DocumentInput> docs;
  for (int i = 0; i < 700; ++i)
    docs.push_back(doc_input("r" + std::to_string(i), "lamp " + std::to_string(i % 7),
                             "keeper logs tide " + std::to_string(i) + (i % 3 ? " gale lamp" : " calm")));
  TempDir dir;
  auto build = [&](const std::string& path, bool one_call) {
    auto w = IndexWriter::open(path, IndexSettings{}, WriterOptions{});
    REQUIRE(w.ok());
    FileRecord f{"/virtual/records.jsonl", "/virtual", 1, 1, "h", "jsonl"};
    REQUIRE((*w)->begin_file(f).ok());
    if (one_call) {
      REQUIRE((*w)->add_documents(docs).ok());
    } else {
      for (const DocumentInput& d : docs) REQUIRE((*w)->add_documents({d}).ok());
    }
    REQUIRE((*w)->finish_file(f).ok());
    REQUIRE((*w)->commit().ok());
  };
  build(dir.str("one.sqlite"), true);
  build(dir.str("each.sqlite"), false);
  OpenIndex one = open_index(dir.str("one.sqlite")), each = open_index(dir.str("each.sqlite"));
  auto s1 = one.reader->begin();
  auto s2 = each.reader->begin();
  REQUIRE(s1.ok());
  REQUIRE(s2.ok());
  CHECK(one.reader->stats().documents == 700);
  CHECK(one.reader->stats().postings == each.reader->stats().postings);
  for (DocId d : {1u, 255u, 256u, 257u, 512u, 700u}) {
    CAPTURE(d);
    CHECK(one.reader->stored_text(d, Field::kBody).value() == each.reader->stored_text(d, Field::kBody).value());
    CHECK(one.reader->forward(d, Field::kBody).value() == each.reader->forward(d, Field::kBody).value());
    CHECK(one.reader->length(d, Field::kTitle) == each.reader->length(d, Field::kTitle));
  }
  for (const char* word : {"tide", "gale", "lamp", "calm"}) {
    auto a = one.reader->term(Field::kBody, word), b = each.reader->term(Field::kBody, word);
    REQUIRE(a.ok());
    REQUIRE(b.ok());
    REQUIRE(a->has_value());
    CHECK((*a)->df == (*b)->df);
    CHECK((*a)->cf == (*b)->cf);
    auto ca = one.reader->postings(**a), cb = each.reader->postings(**b);
    for (; ca->valid() && cb->valid(); ca->next(), cb->next()) {
      CHECK(ca->doc() == cb->doc());
      CHECK(ca->positions().value() == cb->positions().value());
    }
    CHECK(ca->valid() == cb->valid());
  }
}
