// markdown_to_document() and the Markdown reader. Expected texts follow the
// rendering rules of the CommonMark spec (https://spec.commonmark.org, 0.30):
// what a reader of the rendered page sees, with markup and URLs gone.
#include <doctest/doctest.h>

#include <cstdint>
#include <string>

#include "lode/analysis.h"
#include "lode/ingest.h"
#include "temp_dir.h"

using lode::markdown_to_document;

TEST_CASE("front matter is dropped and its title: wins") {
  const auto doc = markdown_to_document(
      "---\n"
      "title: \"Trip notes\"\n"
      "tags: [travel]\n"
      "---\n"
      "# Day one\n"
      "We left early.\n");
  CHECK(doc.kind == "markdown");
  CHECK(doc.title == "Trip notes");
  CHECK(doc.body == "Day one\nWe left early.");
}

TEST_CASE("front matter without a title: the first heading is the title") {
  const auto doc = markdown_to_document("---\ndate: 2024-05-01\n---\n\nIntro text.\n\n## Second level\n# First\n");
  CHECK(doc.title == "Second level");
  CHECK(doc.body == "Intro text.\n\nSecond level\nFirst");
}

TEST_CASE("front matter block scalar title and an unclosed --- is no front matter") {
  CHECK(markdown_to_document("---\ntitle: >\n  Folded\n  title\n---\ntext").title == "Folded title");
  const auto doc = markdown_to_document("---\nnot: front matter\n");
  CHECK(doc.title.empty());
  CHECK(doc.body == "not: front matter");
}

TEST_CASE("ATX headings: closing hashes go and #hashtag is not a heading") {
  const auto doc = markdown_to_document("#hashtag line\n### Heading three ###\n####### seven\n");
  CHECK(doc.title == "Heading three");
  CHECK(doc.body == "#hashtag line\nHeading three\n####### seven");
}

TEST_CASE("setext headings") {
  auto doc = markdown_to_document("Main Title\n==========\n\nSub part\n--------\ntext\n");
  CHECK(doc.title == "Main Title");
  CHECK(doc.body == "Main Title\n\nSub part\ntext");
  doc = markdown_to_document("first line\nsecond line\n---\n");
  CHECK(doc.title == "first line second line");
  // A thematic break after a blank line or a list item is no heading.
  doc = markdown_to_document("para\n\n---\n- item\n---\n");
  CHECK(doc.title.empty());
  CHECK(doc.body == "para\n\nitem");
}

TEST_CASE("emphasis and strike-through and inline code markers go but intraword _ stays") {
  const auto doc = markdown_to_document(
      "Some **bold**, *italic*, __strong__, _em_ and ~~struck~~ text in snake_case_name.\n"
      "Math stays: 2 * 3 * 4. Code: `a*b*c` and ``x ` y``.\n");
  CHECK(doc.body ==
        "Some bold, italic, strong, em and struck text in snake_case_name.\n"
        "Math stays: 2 * 3 * 4. Code: a*b*c and x ` y.");
}

TEST_CASE("links keep their text and images their alt text while destinations go") {
  const auto doc = markdown_to_document(
      "See [the guide](https://example.org/guide \"Guide\") and ![a red fox](img/fox.png).\n"
      "Nested [a [b] c](u(v)w) and a [reference link][ref] and <https://example.org/x>.\n"
      "[ref]: https://example.org/ref\n"
      "Mail <someone@example.org>. A [plain bracket] stays.\n");
  CHECK(doc.body ==
        "See the guide and a red fox.\n"
        "Nested a [b] c and a reference link and https://example.org/x.\n"
        "Mail someone@example.org. A [plain bracket] stays.");
}

TEST_CASE("code fences keep their content verbatim and open no headings") {
  const auto doc = markdown_to_document(
      "Intro\n"
      "```python\n"
      "# not a heading\n"
      "x = [1](2)  # *raw*\n"
      "```\n"
      "~~~~\n"
      "```\n"
      "still code\n"
      "~~~~\n"
      "# Real heading\n");
  CHECK(doc.title == "Real heading");
  CHECK(doc.body == "Intro\n# not a heading\nx = [1](2)  # *raw*\n```\nstill code\nReal heading");
}

TEST_CASE("an unclosed fence runs to the end") {
  const auto doc = markdown_to_document("text\n```\ncode *here*\n");
  CHECK(doc.body == "text\ncode *here*");
}

TEST_CASE("HTML tags and comments go and entities are decoded") {
  const auto doc = markdown_to_document(
      "<div class=\"note\">Tom &amp; Jerry&nbsp;&copy; 2024 &#233;t&#xE9; &bogus; a < b</div>\n"
      "x<br>y <em>in</em>word <!-- hidden --> shown\n"
      "before <!-- multi\n"
      "line comment\n"
      "--> after\n");
  CHECK(doc.body ==
        "Tom & Jerry \xC2\xA9 2024 \xC3\xA9t\xC3\xA9 &bogus; a < b\n"
        "x y inword  shown\n"
        "before\n"
        "after");
}

TEST_CASE("list and task and blockquote markers go and table pipes become spaces") {
  const auto doc = markdown_to_document(
      "- one\n"
      "  * two\n"
      "1. three\n"
      "10) four\n"
      "- [x] done task\n"
      "> quoted\n"
      "> > nested\n"
      "> - quoted item\n"
      "\n"
      "| Name | Age |\n"
      "|:-----|----:|\n"
      "| Ann  | 31  |\n");
  CHECK(doc.body ==
        "one\ntwo\nthree\nfour\ndone task\nquoted\nnested\nquoted item\n\n"
        "Name   Age\n"
        "Ann    31");
}

TEST_CASE("escapes are honoured") {
  const auto doc = markdown_to_document("\\*not emphasis\\* \\[not a link\\](x) \\# \\`tick\\`\n");
  CHECK(doc.body == "*not emphasis* [not a link](x) # `tick`");
}

TEST_CASE("hostile input: deep nesting and long runs finish and keep the text") {
  // Each would be quadratic or recursive in a naive parser.
  const std::size_t n = 200000;
  CHECK(markdown_to_document(std::string(n, '>') + " deep").body == "deep");
  CHECK(markdown_to_document(std::string(n, '[') + "x" + std::string(n, ']')).body ==
        std::string(n, '[') + "x" + std::string(n, ']'));
  std::string links;
  for (std::size_t i = 0; i < n / 10; ++i) links += "[a](";
  CHECK(markdown_to_document(links).body.size() == links.size());
  std::string ticks;
  for (std::size_t i = 1; i < 600; ++i) ticks += std::string(i, '`') + "x";
  CHECK(markdown_to_document(ticks).body.find('x') != std::string::npos);
  CHECK(markdown_to_document(std::string(n, '<') + "end").body == std::string(n, '<') + "end");
  CHECK(markdown_to_document(std::string(n, '*') + "mid" + std::string(n, '*')).body == "mid");
  std::string lists;
  for (std::size_t i = 0; i < n / 4; ++i) lists += "- ";
  CHECK(markdown_to_document(lists + "item").body == "item");
  CHECK(markdown_to_document(std::string(n, '\n')).body.empty());
}

TEST_CASE("read_file on Markdown: id is the path and markup-only files give a warning") {
  lode::testing::TempDir d;
  const std::string p = d.write("notes.md", "---\ntitle: Notes\n---\r\nSome *text*.\r\n");
  auto r = lode::read_file(p, {});
  REQUIRE(r.ok());
  REQUIRE(r->documents.size() == 1);
  CHECK(r->documents[0].external_id == p);
  CHECK(r->documents[0].title == "Notes");
  CHECK(r->documents[0].body == "Some text.");

  r = lode::read_file(d.write("only-markup.md", "<!-- draft -->\n---\n***\n"), {});
  REQUIRE(r.ok());
  CHECK(r->documents.empty());
  REQUIRE(r->warnings.size() == 1);
  CHECK(r->warnings[0] == "no text left once the Markdown markup is removed");
}

TEST_CASE("random markup soup: valid UTF-8 out and titles within bounds") {
  // Fixed seed: the same soup every run. Pieces are chosen to collide:
  // half-open links, stray fences, comments, entities, multi-byte text.
  const char* pieces[] = {"[", "]", "(", ")", "`", "``", "*", "_", "~~", "<", ">", "!", "\\",
                          "&amp;", "&#", "&#x1F600;", "a", " ", "\n", "- ", "# ", "|", "---\n",
                          "```\n", "<!--", "-->", "\xC3\xA9", "\xE2\x82\xAC", "http:", "@", ".",
                          "=\n", "1. ", "> ", "[x]: ", "<b>", "</div>", "\t", "\r\n"};
  std::uint32_t state = 12345;
  auto next = [&state] {  // xorshift32 (Marsaglia 2003)
    state ^= state << 13;
    state ^= state >> 17;
    state ^= state << 5;
    return state;
  };
  for (int round = 0; round < 300; ++round) {
    std::string soup;
    const std::uint32_t len = next() % 400;
    for (std::uint32_t i = 0; i < len; ++i) soup += pieces[next() % (sizeof pieces / sizeof *pieces)];
    CAPTURE(soup);
    const auto doc = markdown_to_document(soup);
    CHECK(lode::is_valid_utf8(doc.body));
    CHECK(lode::is_valid_utf8(doc.title));
    CHECK(doc.title.size() <= 200);
    // Stripping only shrinks: no construct's text is longer than its source
    // (an entity's UTF-8 is shorter than its reference, a tag leaves one space).
    CHECK(doc.body.size() <= soup.size());
  }
}
