// read_file(): file access, hashing, decoding and the plain-text reader.
#include <sys/stat.h>
#include <unistd.h>

#include <doctest/doctest.h>

#include <string>

#include "lode/ingest.h"
#include "temp_dir.h"

namespace {

using lode::Code;
using lode::ReadOptions;
using lode::testing::TempDir;

lode::ReadResult read_ok(const std::string& path, const ReadOptions& options = {}) {
  auto r = lode::read_file(path, options);
  REQUIRE_MESSAGE(r.ok(), r.status().to_string());
  return std::move(r).value();
}

bool mentions(const lode::Status& s, const std::string& what) {
  return s.message().find(what) != std::string::npos;
}

}  // namespace

TEST_CASE("plain text: one document titled by its first non-blank line") {
  TempDir d;
  const std::string p = d.write("note.txt", "\n   \n  Shopping list  \nmilk\neggs\n");
  const auto r = read_ok(p);
  REQUIRE(r.documents.size() == 1);
  const auto& doc = r.documents[0];
  CHECK(doc.external_id == p);
  CHECK(doc.kind == "text");
  CHECK(doc.title == "Shopping list");
  CHECK(doc.body == "\n   \n  Shopping list  \nmilk\neggs\n");
  CHECK(r.warnings.empty());
}

TEST_CASE("a long first line is cut to 200 bytes without splitting a character") {
  TempDir d;
  const std::string line = std::string(199, 'a') + "\xC3\xA9" + "tail";  // é spans bytes 199-200
  const auto r = read_ok(d.write("long.txt", line + "\nrest"));
  REQUIRE(r.documents.size() == 1);
  CHECK(r.documents[0].title == std::string(199, 'a'));
  const auto r2 = read_ok(d.write("long2.txt", std::string(198, 'a') + "\xC3\xA9" + "tail"));
  CHECK(r2.documents[0].title == std::string(198, 'a') + "\xC3\xA9");
}

TEST_CASE("empty and blank files give no document and an 'empty file' warning") {
  TempDir d;
  for (const std::string name : {"empty.txt", "blank.txt", "empty.md", "blank.md", "noext"}) {
    CAPTURE(name);
    const auto r = read_ok(d.write(name, name.rfind("blank", 0) == 0 ? " \n\t\r\n  " : ""));
    CHECK(r.documents.empty());
    REQUIRE(r.warnings.size() == 1);
    CHECK(r.warnings[0] == "empty file");
  }
}

TEST_CASE("binary files are recognised and skipped, not failed") {
  TempDir d;
  // A GIF signature under a text name: content decides.
  const std::string gif = d.write("image.txt", std::string("GIF89a\0\0\x01", 9) + "text");
  auto r = lode::read_file(gif, {});
  REQUIRE(r.ok());
  CHECK(r->skipped == "image (GIF signature)");
  CHECK(r->documents.empty());
  CHECK_FALSE(r->content_hash.empty());

  // A NUL byte with no known signature: binary.
  const std::string with_nul = d.write("data.txt", std::string("abc\0\0\x01", 6) + "text");
  r = lode::read_file(with_nul, {});
  REQUIRE(r.ok());
  CHECK(r->skipped == "binary (NUL byte at offset 3)");

  // No NUL, but mostly bytes that are not UTF-8.
  std::string noise;
  for (int i = 0; i < 4000; ++i) noise += static_cast<char>(0x80 + (i * 37) % 0x7F);
  const std::string noisy = d.write("blob.dat", noise);
  r = lode::read_file(noisy, {});
  REQUIRE(r.ok());
  CHECK(r->skipped.rfind("binary (", 0) == 0);
  CHECK(r->documents.empty());

  // A media extension decides without reading: even past the size limit.
  const std::string big = d.write("Holiday.JPG", std::string(4096, 'x'));
  lode::ReadOptions small;
  small.max_file_bytes = 100;
  r = lode::read_file(big, small);
  REQUIRE(r.ok());
  CHECK(r->skipped == "image (.jpg)");
  CHECK(r->size == 4096);
  CHECK(r->content_hash.empty());

  // A real read failure is still an error.
  r = lode::read_file(d.path("missing.txt"), {});
  CHECK(r.status().code() == Code::kNotFound);

  // A NUL after the first 8 KiB is not looked for: still text.
  const std::string late_nul = std::string(9000, 'x') + std::string(1, '\0');
  CHECK(read_ok(d.write("late.txt", late_nul)).documents.size() == 1);
}

TEST_CASE("invalid UTF-8 is repaired with one warning giving offset and count") {
  TempDir d;
  // Valid UTF-8 (é) with damage: repaired, not re-decoded.
  const auto r = read_ok(d.write("damaged.txt", "caf\xC3\xA9 au lait, cr\xE8me br\xFBl\xE9" "e\n"));
  REQUIRE(r.documents.size() == 1);
  CHECK(r.documents[0].body == "caf\xC3\xA9 au lait, cr\xEF\xBF\xBDme br\xEF\xBF\xBDl\xEF\xBF\xBD" "e\n");
  REQUIRE(r.warnings.size() == 1);
  CHECK(r.warnings[0] == "invalid UTF-8 at byte 17 (3 sequences replaced)");
}

TEST_CASE("text with no UTF-8 at all is decoded from the charset ICU detects") {
  TempDir d;
  const auto r = read_ok(d.write("latin1.txt", "caf\xE9 au lait, cr\xE8me br\xFBl\xE9" "e\n"));
  REQUIRE(r.documents.size() == 1);
  CHECK(r.documents[0].body == "caf\xC3\xA9 au lait, cr\xC3\xA8me br\xC3\xBBl\xC3\xA9" "e\n");
  REQUIRE(r.warnings.size() == 1);
  CHECK(r.warnings[0].rfind("not UTF-8: decoded as ISO-8859-1 (ICU detection, confidence ", 0) == 0);
  // One or two stray bytes are treated as damage.
  const auto one = read_ok(d.write("stray.txt", "plain text with one \xFF byte\n"));
  REQUIRE(one.warnings.size() == 1);
  CHECK(one.warnings[0] == "invalid UTF-8 at byte 20 (1 sequence replaced)");
}

TEST_CASE("a UTF-8 byte order mark is dropped and offsets still count it") {
  TempDir d;
  auto r = read_ok(d.write("bom.txt", "\xEF\xBB\xBFTitle\nbody\n"));
  REQUIRE(r.documents.size() == 1);
  CHECK(r.documents[0].title == "Title");
  CHECK(r.documents[0].body == "Title\nbody\n");
  r = read_ok(d.write("bom-bad.txt", "\xEF\xBB\xBF" "ab\xFF" "cd"));
  REQUIRE(r.warnings.size() == 1);
  CHECK(r.warnings[0] == "invalid UTF-8 at byte 5 (1 sequence replaced)");
}

TEST_CASE("CRLF and lone CR line endings become LF") {
  TempDir d;
  const auto r = read_ok(d.write("dos.txt", "First line\r\nsecond\r\nthird\rfourth\r\n"));
  REQUIRE(r.documents.size() == 1);
  CHECK(r.documents[0].title == "First line");
  CHECK(r.documents[0].body == "First line\nsecond\nthird\nfourth\n");
}

TEST_CASE("the format follows the extension case-insensitively") {
  TempDir d;
  CHECK(read_ok(d.write("README.MD", "# Hello\nworld")).documents.at(0).kind == "markdown");
  CHECK(read_ok(d.write("x.markdown", "# Hello")).documents.at(0).kind == "markdown");
  CHECK(read_ok(d.write("x.NDJSON", "{\"text\":\"t\"}")).documents.at(0).kind == "jsonl");
  CHECK(read_ok(d.write("x.jsonl", "{\"text\":\"t\"}")).documents.at(0).kind == "jsonl");
  CHECK(read_ok(d.write("x.log", "# not a heading")).documents.at(0).kind == "text");
  CHECK(read_ok(d.write("Makefile", "all:\n")).documents.at(0).kind == "text");
}

TEST_CASE("files above max_file_bytes are refused with both sizes") {
  TempDir d;
  const std::string p = d.write("big.txt", std::string(11, 'x'));
  ReadOptions o;
  o.max_file_bytes = 10;
  auto r = lode::read_file(p, o);
  REQUIRE_FALSE(r.ok());
  CHECK(r.status().code() == Code::kLimit);
  CHECK(mentions(r.status(), p));
  CHECK(mentions(r.status(), "11 bytes"));
  CHECK(mentions(r.status(), "10 bytes"));
  o.max_file_bytes = 11;  // at the limit is allowed
  CHECK(read_ok(p, o).documents.size() == 1);
  o.max_file_bytes = 0;  // no limit
  CHECK(read_ok(p, o).documents.size() == 1);
}

TEST_CASE("extracted text past max_text_bytes is cut at a character and later records are dropped") {
  TempDir d;
  // Three records of 10 bytes of text each ("é" is 2 bytes).
  const std::string p = d.write("dump.jsonl", "{\"id\": \"a\", \"text\": \"aaaaaaaaaa\"}\n"
                                              "{\"id\": \"b\", \"text\": \"ééééé\"}\n"
                                              "{\"id\": \"c\", \"text\": \"cccccccccc\"}\n");
  ReadOptions o;
  o.max_text_bytes = 15;
  const auto r = read_ok(p, o);
  REQUIRE(r.documents.size() == 2);
  CHECK(r.documents[0].body == "aaaaaaaaaa");
  CHECK(r.documents[1].body == "éé");  // 5 bytes left: two whole characters
  REQUIRE(r.warnings.size() == 1);
  CHECK(r.warnings[0].find("limit of 15 bytes") != std::string::npos);
  CHECK(r.warnings[0].find("--max-text-mb") != std::string::npos);
  CHECK(r.warnings[0].find("1 document dropped") != std::string::npos);
  o.max_text_bytes = 0;  // no limit
  CHECK(read_ok(p, o).documents.size() == 3);
}

TEST_CASE("content hash: XXH3-128 of the file bytes in canonical lowercase hex") {
  TempDir d;
  // Published value: python-xxhash xxh3_128_hexdigest(struct.pack('<B', 42)),
  // quoted in ClickHouse's xxh3_128 test notes (tests/queries/0_stateless).
  CHECK(read_ok(d.write("star.txt", "*")).content_hash == "14c9ae9594c463c479d03016b7aeed0d");
  // Same source: xxh3_128_hexdigest(b'ClickHouse').
  CHECK(read_ok(d.write("word.txt", "ClickHouse")).content_hash == "14c27b7bef95d36fecf5520ca2daf030");
  // Recalled from memory (xxhsum -H2 of an empty file).
  CHECK(read_ok(d.write("empty.txt", "")).content_hash == "99aa06d3014798d86001c324468d497f");

  // Stable for equal bytes, different when one byte changes; the raw bytes
  // count (a BOM or CRLF changes the hash though not the text).
  const auto a = read_ok(d.write("a.txt", "same words\n")).content_hash;
  CHECK(read_ok(d.write("b.txt", "same words\n")).content_hash == a);
  CHECK(read_ok(d.write("c.txt", "same words!\n")).content_hash != a);
  CHECK(read_ok(d.write("e.txt", "same words\r\n")).content_hash != a);
  CHECK(a.size() == 32);
  CHECK(a.find_first_not_of("0123456789abcdef") == std::string::npos);
}

TEST_CASE("a missing file is NotFound and a folder or unreadable file an IOError naming the path") {
  TempDir d;
  const std::string missing = d.path("gone.txt");
  auto r = lode::read_file(missing, {});
  REQUIRE_FALSE(r.ok());
  CHECK(r.status().code() == Code::kNotFound);
  CHECK(mentions(r.status(), missing));

  const std::string folder = d.mkdir("folder.txt");
  r = lode::read_file(folder, {});
  REQUIRE_FALSE(r.ok());
  CHECK(r.status().code() == Code::kIOError);
  CHECK(mentions(r.status(), folder));
  CHECK(mentions(r.status(), "Is a directory"));  // strerror(EISDIR), glibc wording

  const std::string locked = d.write("locked.txt", "secret");
  REQUIRE(::chmod(locked.c_str(), 0) == 0);
  REQUIRE(::chmod(d.root().c_str(), 0755) == 0);
  // Root reads any file, so the denial is checked in a process without root
  // (see run_unprivileged); when the suite is not root this process will do.
  const auto child = lode::testing::run_unprivileged([&] {
    const auto rr = lode::read_file(locked, {});
    return rr.ok() ? std::string("read ok") : rr.status().to_string();
  });
  const std::string outcome = child ? *child
                              : ::geteuid() != 0 ? lode::read_file(locked, {}).status().to_string()
                                                 : std::string();
  if (outcome.empty()) {
    MESSAGE("running as root without setuid: unreadable-file case not exercised");
  } else {
    CHECK(outcome == "I/O error: " + locked + ": Permission denied");
  }
}

TEST_CASE("a named pipe is refused at once and not waited on") {
  TempDir d;
  const std::string fifo = d.path("pipe.txt");
  REQUIRE(::mkfifo(fifo.c_str(), 0644) == 0);
  auto r = lode::read_file(fifo, {});  // would block forever without O_NONBLOCK
  REQUIRE_FALSE(r.ok());
  CHECK(r.status().code() == Code::kUnsupported);
  CHECK(mentions(r.status(), fifo));
  // The crawl never lists it, and names it.
  const auto c = lode::crawl({d.root().string()}, {});
  REQUIRE(c.ok());
  CHECK(c->files.empty());
  REQUIRE(c->problems.size() == 1);
  CHECK(c->problems[0].reason == "a named pipe, not read");
}
