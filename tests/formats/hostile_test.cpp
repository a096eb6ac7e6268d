// The hostile set: each bad file yields its named problem, recorded in the
// index, and what was indexed before stays searchable.
#include <sys/stat.h>
#include <unistd.h>

#include <doctest/doctest.h>

#include <cstdlib>

#include "harness.h"
#include "ingest/temp_dir.h"
#include "make_files.h"

namespace {

using namespace lode::testing;

std::string read_all(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  return std::string(std::istreambuf_iterator<char>(in), {});
}

// An encrypted copy of `pdf` made with qpdf (installed by scripts/setup-debian.sh).
std::string encrypt_pdf(const Scratch& s, const std::string& pdf) {
  const std::string plain = s.other("plain.pdf"), locked = s.other("locked.pdf");
  { std::ofstream(plain, std::ios::binary) << pdf; }
  const std::string cmd = "qpdf --encrypt secretuser secretowner 256 -- '" + plain + "' '" + locked + "'";
  REQUIRE_MESSAGE(std::system(cmd.c_str()) == 0, "qpdf is needed: run scripts/setup-debian.sh");
  return read_all(locked);
}

bool recorded(const std::string& index, const std::string& path, const std::string& words, bool error) {
  auto reader = lode::IndexReader::open(index);
  REQUIRE(reader.ok());
  auto scope = (*reader)->begin();
  auto problems = (*reader)->problems();
  REQUIRE(problems.ok());
  for (auto& p : *problems)
    if (p.path == path && p.error == error && p.message.find(words) != std::string::npos) return true;
  return false;
}

TEST_CASE("hostile files give named errors and lose nothing indexed") {
  Scratch s;
  // First run: good versions, each with a word of its own.
  s.write("a.pdf", make_pdf({"anchorage soundings"}));
  s.write("b.pdf", make_pdf({"breakwater repairs"}));
  s.write("c.docx", make_docx(docx_paragraph("capstan grease"), "C", "X"));
  s.write("d.html", "<p>davit maintenance</p>");
  s.write("e.txt", "enamel buoys\n");
  s.write("keep.txt", "keelson timber\n");
  auto first = index_tree(s.index(), {s.tree()});
  REQUIRE(first.failed == 0);
  REQUIRE(first.added == 6);

  // Second run: each replaced by a hostile version.
  const std::string good_pdf = make_pdf({"anchorage soundings", "more pages"});
  s.write("a.pdf", good_pdf.substr(0, good_pdf.size() / 2));
  s.write("b.pdf", encrypt_pdf(s, make_pdf({"breakwater repairs"})));
  // A zip bomb in miniature: 8 MiB of text that deflates to a few KiB,
  // against a 1 MiB budget.
  s.write("c.docx", make_docx(docx_paragraph(std::string(8 << 20, 'z')), "C", "X"));
  std::string deep = "<html><body>";
  for (int i = 0; i < 100000; ++i) deep += "<div>";
  s.write("d.html", deep + "deepword");
  s.write("e.txt", "");
  s.write("f.txt", "valid caf\xC3\xA9 then a bad byte \xFF here\n");

  lode::IndexRunOptions options;
  options.read.max_unpacked_bytes = 1 << 20;
  auto second = index_tree(s.index(), {s.tree()}, options);
  CHECK(second.failed == 4);
  CHECK(has_problem(second, s.file("a.pdf"), "truncated PDF"));
  CHECK(has_problem(second, s.file("b.pdf"), "encrypted PDF"));
  CHECK(has_problem(second, s.file("c.docx"), "expands past 1048576 bytes"));
  CHECK(has_problem(second, s.file("d.html"), "HTML nested 100002 elements deep, above the limit of 512"));
  CHECK(recorded(s.index(), s.file("a.pdf"), "truncated PDF", true));
  CHECK(recorded(s.index(), s.file("b.pdf"), "encrypted PDF", true));
  CHECK(recorded(s.index(), s.file("c.docx"), "zip bomb", true));
  CHECK(recorded(s.index(), s.file("d.html"), "nested", true));
  CHECK(recorded(s.index(), s.file("e.txt"), "empty file", false));
  CHECK(recorded(s.index(), s.file("f.txt"), "invalid UTF-8 at byte 28 (1 sequence replaced)", false));

  // The old versions of the files that failed are still found.
  for (auto [word, id] : {std::pair{"anchorage", "a.pdf"}, {"breakwater", "b.pdf"}, {"capstan", "c.docx"},
                          {"davit", "d.html"}, {"keelson", "keep.txt"}}) {
    CAPTURE(word);
    CHECK(hit_ids(search(s.index(), word)) == std::vector<std::string>{id});
  }
  // The empty file replaced its old text (nothing to find); the repaired file is indexed.
  CHECK(search(s.index(), "enamel").hits.empty());
  CHECK(hit_ids(search(s.index(), "café")) == std::vector<std::string>{"f.txt"});

  // Fixing a file clears its recorded problem.
  s.write("a.pdf", good_pdf);
  auto third = index_tree(s.index(), {s.tree()}, options);
  CHECK_FALSE(recorded(s.index(), s.file("a.pdf"), "truncated", true));
  CHECK(recorded(s.index(), s.file("b.pdf"), "encrypted PDF", true));
  CHECK(hit_ids(search(s.index(), "pages")) == std::vector<std::string>{"a.pdf"});
}

TEST_CASE("a symlink loop is reported and recorded, the rest indexed") {
  Scratch s;
  s.write("sub/x.txt", "xebec rigging\n");
  REQUIRE(::symlink(s.tree().c_str(), s.file("sub/back").c_str()) == 0);
  lode::IndexRunOptions options;
  options.crawl.follow_symlinks = true;
  auto r = index_tree(s.index(), {s.tree()}, options);
  CHECK(has_problem(r, s.file("sub/back"), "symlink loop"));
  CHECK(recorded(s.index(), s.file("sub/back"), "symlink loop", true));
  CHECK(hit_ids(search(s.index(), "xebec")) == std::vector<std::string>{"sub/x.txt"});
}

TEST_CASE("a file replaced between crawl and read is indexed as read") {
  Scratch s;
  s.write("a.txt", "first alpha\n");
  s.write("b.txt", "second bravo\n");
  s.write("c.txt", "third charlie\n");
  lode::IndexRunOptions options;
  options.jobs = 1;
  options.read_ahead = 1;  // c.txt is not read before a.txt is applied
  auto w = lode::IndexWriter::open(s.index(), std::nullopt);
  REQUIRE(w.ok());
  bool replaced = false;
  auto r = lode::index_paths(**w, {s.tree()}, options, [&](const lode::IndexProgress& p) {
    if (!replaced && p.current == s.file("a.txt")) {
      s.write("c.txt", "replaced content with the word delta and more bytes\n");
      replaced = true;
    }
  });
  REQUIRE(r.ok());
  REQUIRE(replaced);
  w->reset();
  CHECK(hit_ids(search(s.index(), "delta")) == std::vector<std::string>{"c.txt"});
  CHECK(search(s.index(), "charlie").hits.empty());
  // The recorded size and time are those of the content read: nothing to redo.
  auto again = index_tree(s.index(), {s.tree()});
  CHECK(again.unchanged == 3);
  CHECK(again.updated == 0);
}

TEST_CASE("an unreadable file is reported by name and recorded (run as an unprivileged user)") {
  Scratch s;
  s.write("open.txt", "ordinary lanyard\n");
  const std::string locked = s.write("locked.txt", "secret hawser\n");
  REQUIRE(::chmod(locked.c_str(), 0) == 0);
  // The child must be able to write the index: open the scratch folder up.
  const std::string root = std::filesystem::path(s.tree()).parent_path().string();
  REQUIRE(::chmod(root.c_str(), 0777) == 0);
  REQUIRE(::chmod(s.tree().c_str(), 0777) == 0);
  auto out = run_unprivileged([&]() -> std::string {
    auto w = lode::IndexWriter::open(s.index(), std::nullopt);
    if (!w.ok()) return "open failed: " + w.status().to_string();
    auto r = lode::index_paths(**w, {s.tree()}, {});
    if (!r.ok()) return "run failed: " + r.status().to_string();
    std::string text;
    for (auto& p : r->problems) text += p.path + ": " + p.message + "\n";
    return text;
  });
  if (!out) {
    // Not root: the test user cannot read a mode-000 file either.
    auto r = index_tree(s.index(), {s.tree()});
    out = "";
    for (auto& p : r.problems) *out += p.path + ": " + p.message + "\n";
  }
  CHECK(*out == locked + ": Permission denied\n");
  CHECK(recorded(s.index(), locked, "Permission denied", true));
  CHECK(hit_ids(search(s.index(), "lanyard")) == std::vector<std::string>{"open.txt"});
}

}  // namespace
