// The JSON Lines reader (through read_file, as callers use it).
#include <doctest/doctest.h>

#include <fstream>
#include <string>
#include <vector>

#include "ingest/readers.h"
#include "lode/ingest.h"
#include "stream_util.h"
#include "temp_dir.h"

namespace {

using lode::ReadOptions;
using lode::testing::TempDir;
using namespace lode::testing;

lode::ReadResult read_jsonl(const TempDir& d, const std::string& content, const ReadOptions& o = {}) {
  auto r = lode::read_file(d.write("records.jsonl", content), o);
  REQUIRE_MESSAGE(r.ok(), r.status().to_string());
  return std::move(r).value();
}

}  // namespace

TEST_CASE("one document per record with string or number ids") {
  TempDir d;
  const auto r = read_jsonl(d,
                            "{\"id\": \"doc-1\", \"title\": \"First\", \"text\": \"alpha beta\"}\n"
                            "{\"id\": 42, \"text\": \"gamma\"}\n"
                            "{\"id\": -7, \"text\": \"delta\", \"extra\": [1, 2]}\n"
                            "{\"id\": 18446744073709551615, \"text\": \"max\"}\n"
                            "{\"id\": 1.5, \"text\": \"half\"}\n");
  CHECK(r.warnings.empty());
  REQUIRE(r.documents.size() == 5);
  CHECK(r.documents[0].external_id == "doc-1");
  CHECK(r.documents[0].title == "First");
  CHECK(r.documents[0].body == "alpha beta");
  CHECK(r.documents[0].kind == "jsonl");
  CHECK(r.documents[1].external_id == "42");
  CHECK(r.documents[1].title.empty());
  CHECK(r.documents[2].external_id == "-7");
  CHECK(r.documents[3].external_id == "18446744073709551615");
  CHECK(r.documents[4].external_id == "1.5");
}

TEST_CASE("a record without an id is addressed by path and line number") {
  TempDir d;
  const auto r = read_jsonl(d, "\n{\"text\": \"no id\"}\n\n{\"id\": \"\", \"text\": \"empty id\"}\n");
  REQUIRE(r.documents.size() == 2);
  CHECK(r.documents[0].external_id == d.path("records.jsonl") + "#2");  // blank lines count
  CHECK(r.documents[1].external_id == d.path("records.jsonl") + "#4");
}

TEST_CASE("bad lines are skipped with a warning naming the line") {
  TempDir d;
  const auto r = read_jsonl(d,
                            "{\"id\": 1, \"text\": \"ok\"}\n"
                            "{\"id\": 2, \"title\": \"no text\"}\n"
                            "{\"id\": 3, \"text\": \"unterminated}\n"
                            "[\"an\", \"array\"]\n"
                            "{\"id\": true, \"text\": \"bool id\"}\n"
                            "{\"id\": 6, \"text\": 12}\n"
                            "{\"id\": 7, \"text\": \"t\", \"title\": {\"x\": 1}}\n"
                            "{\"id\": 8, \"text\": [\"a\", 2]}\n"
                            "{\"id\": 9, \"text\": null}\n"
                            "{\"id\": 10, \"text\": \"ok too\"} trailing\n"
                            "{\"id\": 1e999, \"text\": \"overflowing id\"}\n");
  REQUIRE(r.documents.size() == 1);
  CHECK(r.documents[0].external_id == "1");
  REQUIRE(r.warnings.size() == 10);
  CHECK(r.warnings[0] == "line 2: missing field \"text\"");
  CHECK(r.warnings[1].rfind("line 3: invalid JSON: column ", 0) == 0);
  CHECK(r.warnings[2] == "line 4: not a JSON object");
  CHECK(r.warnings[3] == "line 5: field \"id\" must be a string or a number");
  CHECK(r.warnings[4] == "line 6: field \"text\" must be a string or an array of strings");
  CHECK(r.warnings[5] == "line 7: field \"title\" must be a string");
  CHECK(r.warnings[6] == "line 8: field \"text\" array holds a non-string");
  CHECK(r.warnings[7] == "line 9: missing field \"text\"");
  CHECK(r.warnings[8].rfind("line 10: invalid JSON: column ", 0) == 0);
  // 1e999 overflows a double: the parser refuses it.
  CHECK(r.warnings[9] == "line 11: invalid JSON: number overflow parsing '1e999'");
}

TEST_CASE("only the first 10 bad lines are listed and then counted") {
  TempDir d;
  std::string content;
  for (int i = 0; i < 25; ++i) content += "{oops\n";
  content += "{\"text\": \"fine\"}\n";
  const auto r = read_jsonl(d, content);
  CHECK(r.documents.size() == 1);
  REQUIRE(r.warnings.size() == 11);
  CHECK(r.warnings[9].rfind("line 10: ", 0) == 0);
  CHECK(r.warnings[10] == "15 more bad lines skipped (25 in all)");
}

TEST_CASE("duplicate ids: every record kept and one warning") {
  TempDir d;
  const auto r = read_jsonl(d,
                            "{\"id\": \"a\", \"text\": \"1\"}\n"
                            "{\"id\": \"b\", \"text\": \"2\"}\n"
                            "{\"id\": \"a\", \"text\": \"3\"}\n"
                            "{\"id\": \"b\", \"text\": \"4\"}\n");
  CHECK(r.documents.size() == 4);
  REQUIRE(r.warnings.size() == 1);
  CHECK(r.warnings[0] ==
        "2 duplicate id(s), first id \"a\" on line 3 (first seen on line 1); every record is kept");
}

TEST_CASE("field names come from ReadOptions and string arrays are joined with newlines") {
  TempDir d;
  ReadOptions o;
  o.id_field = "docno";
  o.title_field = "headline";
  o.text_field = "paragraphs";
  const auto r = read_jsonl(d,
                            "{\"docno\": \"X-1\", \"headline\": \"Storm\", \"paragraphs\": [\"Wind.\", \"Rain.\"],"
                            " \"text\": \"ignored\", \"id\": \"ignored\"}\n"
                            "{\"id\": \"Y\", \"text\": \"no paragraphs field\"}\n",
                            o);
  REQUIRE(r.documents.size() == 1);
  CHECK(r.documents[0].external_id == "X-1");
  CHECK(r.documents[0].title == "Storm");
  CHECK(r.documents[0].body == "Wind.\nRain.");
  REQUIRE(r.warnings.size() == 1);
  CHECK(r.warnings[0] == "line 2: missing field \"paragraphs\"");
}

TEST_CASE("empty JSON Lines files give no document and CRLF and BOM are fine") {
  TempDir d;
  auto r = read_jsonl(d, "");
  CHECK(r.documents.empty());
  CHECK(r.warnings == std::vector<std::string>{"empty file"});
  r = read_jsonl(d, "\n  \n\t\n");
  CHECK(r.documents.empty());
  CHECK(r.warnings == std::vector<std::string>{"empty file"});
  r = read_jsonl(d, "\xEF\xBB\xBF{\"id\": 1, \"text\": \"a\"}\r\n{\"id\": 2, \"text\": \"b\\r\\nc\"}\r\n");
  CHECK(r.warnings.empty());
  REQUIRE(r.documents.size() == 2);
  CHECK(r.documents[1].body == "b\r\nc");  // escaped CR LF inside a string is content
}

TEST_CASE("escapes decode to UTF-8 and invalid UTF-8 in the file is repaired first") {
  TempDir d;
  const auto r = read_jsonl(d,
                            "{\"text\": \"caf\\u00e9 \\ud83d\\ude00\"}\n"
                            "{\"text\": \"bad \xFF byte\"}\n"
                            "{\"text\": \"lone \\ud800 surrogate\"}\n");
  REQUIRE(r.documents.size() == 2);
  CHECK(r.documents[0].body == "caf\xC3\xA9 \xF0\x9F\x98\x80");
  CHECK(r.documents[1].body == "bad \xEF\xBF\xBD byte");
  REQUIRE(r.warnings.size() == 2);
  // Line 1 is 35 bytes with its newline; the bad byte is at 14 in line 2.
  CHECK(r.warnings[0] == "invalid UTF-8 at byte 49 (1 sequence replaced)");
  CHECK(r.warnings[1].rfind("line 3: invalid JSON: column ", 0) == 0);
}

TEST_CASE("deeply nested or huge lines are handled without crashing") {
  TempDir d;
  const std::size_t depth = 100000;
  const std::string nested = std::string(depth, '[') + std::string(depth, ']');
  const std::string unclosed = "{\"text\": " + std::string(depth, '[');
  const std::string long_text = "{\"text\": \"" + std::string(1 << 20, 'w') + "\"}";
  const auto r = read_jsonl(d, nested + "\n" + unclosed + "\n" + long_text + "\n");
  REQUIRE(r.documents.size() == 1);
  CHECK(r.documents[0].body.size() == std::size_t{1} << 20);
  REQUIRE(r.warnings.size() == 2);
  CHECK(r.warnings[0] == "line 1: not a JSON object");
  CHECK(r.warnings[1].rfind("line 2: invalid JSON: ", 0) == 0);
  CHECK(r.warnings[1].size() < 300);  // the parser's message is cut short
}

TEST_CASE("read in slices of any size, a file gives the records, warnings and hash of read_file") {
  TempDir d;
  std::string content = "\xEF\xBB\xBF{\"id\": \"a\", \"title\": \"T\\u00e9\", \"text\": \"first r\xC3\xA9sum\xC3\xA9\"}\r\n";
  content += "\n   \n{\"text\": \"no id here\"}\n";
  content += "{\"id\": \"b\", \"text\": \"bad \xFF byte\"}\n";
  content += "not json at all\n";
  content += "{\"id\": \"a\", \"text\": [\"repeated\", \"id\"]}\n";
  for (int i = 0; i < 40; ++i) content += "{\"id\": " + std::to_string(100 + i) + ", \"text\": \"filler words " + std::to_string(i) + "\"}\n";
  content += "{\"id\": \"last\", \"text\": \"no newline at the end\"}";
  const std::string path = d.write("records.jsonl", content);
  auto whole = lode::read_file(path, {});
  REQUIRE(whole.ok());
  REQUIRE(whole->documents.size() == 45);
  REQUIRE(whole->warnings.size() == 3);  // invalid UTF-8, the bad line, the repeated id
  for (std::size_t slice : {std::size_t{1}, std::size_t{2}, std::size_t{7}, std::size_t{64}, std::size_t{1000},
                            content.size() + 1}) {
    CAPTURE(slice);
    check_same_as_whole(read_streamed(path, slice), *whole);
  }
}

TEST_CASE("a streamed line longer than the text limit is skipped, and the lines after it keep their numbers") {
  TempDir d;
  const std::string path = d.write("long.jsonl", "{\"text\": \"short one\"}\n{\"text\": \"" + std::string(500, 'x') +
                                                     "\"}\n{\"text\": \"after the long line\"}\n");
  ReadOptions o;
  o.max_text_bytes = 100;
  for (std::size_t slice : {std::size_t{3}, std::size_t{64}, std::size_t{4096}}) {
    CAPTURE(slice);
    const Streamed s = read_streamed(path, slice, o);
    REQUIRE(s.documents.size() == 2);
    CHECK(s.documents[0].body == "short one");
    CHECK(s.documents[1].body == "after the long line");
    CHECK(s.documents[1].external_id == path + "#3");
    REQUIRE(s.finish.warnings.size() == 1);
    CHECK(s.finish.warnings[0] == "line 2: longer than 100 bytes (raise it with --max-text-mb)");
  }
}

TEST_CASE("a streamed file is refused as binary, or when it changes while it is read") {
  TempDir d;
  // A NUL in the first 8 KiB refuses the file however the reads fall.
  const std::string bin_path = d.write("bin.jsonl", std::string("{\"text\": \"a\"}\n\0\1\2", 17));
  for (std::size_t slice : {std::size_t{1}, std::size_t{5}, std::size_t{1} << 20}) {
    CAPTURE(slice);
    auto bin = lode::JsonlStream::open(bin_path, {});
    REQUIRE(bin.ok());
    const lode::Status refused = read_rest(**bin, slice).error;
    CHECK(refused.code() == lode::Code::kUnsupported);
    CHECK(refused.message() == bin_path + ": binary file (NUL byte at offset 14)");
  }

  const std::string path = d.write("grows.jsonl", "{\"text\": \"one\"}\n{\"text\": \"two\"}\n");
  auto s = lode::JsonlStream::open(path, {});
  REQUIRE(s.ok());
  auto first = (*s)->next(17);
  REQUIRE(first.ok());
  CHECK(first->size() == 1);
  {
    std::ofstream more(path, std::ios::app);
    more << "{\"text\": \"three\"}\n";
  }
  const lode::Status seen = read_rest(**s, 17).error;
  CHECK(seen.code() == lode::Code::kIOError);
  CHECK(seen.message() == path + ": changed while being read (size or modification time moved)");

  auto missing = lode::JsonlStream::open(d.path("none.jsonl"), {});
  REQUIRE_FALSE(missing.ok());
  CHECK(missing.status().code() == lode::Code::kNotFound);
}

TEST_CASE("streams_as_jsonl: JSON Lines by name and content, above the size set") {
  TempDir d;
  ReadOptions o;
  o.stream_jsonl_bytes = 10;
  const std::string big = d.write("a.jsonl", "{\"text\": \"enough bytes\"}\n");
  CHECK(lode::streams_as_jsonl(big, 26, o));
  CHECK_FALSE(lode::streams_as_jsonl(big, 10, o));  // not above the size
  CHECK(lode::streams_as_jsonl(d.write("b.NDJSON", "{\"text\": \"enough bytes\"}\n"), 26, o));
  CHECK_FALSE(lode::streams_as_jsonl(d.write("c.txt", "{\"text\": \"enough bytes\"}\n"), 26, o));
  CHECK_FALSE(lode::streams_as_jsonl(d.write("d.jsonl", "%PDF-1.4 a PDF named .jsonl"), 26, o));  // content wins
  CHECK_FALSE(lode::streams_as_jsonl(d.path("gone.jsonl"), 26, o));
  o.stream_jsonl_bytes = 0;
  CHECK_FALSE(lode::streams_as_jsonl(big, 26, o));
}

TEST_CASE("repeated ids are looked for among a bounded number of records, and the warning says so") {
  const lode::ReadOptions o;
  std::vector<lode::Document> docs;
  // Ids a, b, c are checked; the repeat of b (record 3) is found; the repeat
  // of a after the cap (record 5) is not, and a warning says why.
  lode::ingest::JsonlRecords records("r.jsonl", o, 3);
  records.add("{\"id\":\"a\",\"text\":\"x\"}\n{\"id\":\"b\",\"text\":\"x\"}\n{\"id\":\"b\",\"text\":\"x\"}\n"
              "{\"id\":\"c\",\"text\":\"x\"}\n{\"id\":\"a\",\"text\":\"x\"}\n",
              docs);
  CHECK(docs.size() == 5);
  CHECK(records.warnings() ==
        std::vector<std::string>{"1 duplicate id(s), first id \"b\" on line 3 (first seen on line 2); every record is kept",
                                 "repeated ids were looked for among the first 3 distinct ids only"});
  // Under the cap there is no such warning.
  lode::ingest::JsonlRecords all("r.jsonl", o);
  docs.clear();
  all.add("{\"id\":\"a\",\"text\":\"x\"}\n{\"id\":\"a\",\"text\":\"x\"}\n", docs);
  CHECK(all.warnings() ==
        std::vector<std::string>{"1 duplicate id(s), first id \"a\" on line 2 (first seen on line 1); every record is kept"});
}
