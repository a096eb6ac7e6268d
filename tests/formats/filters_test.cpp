// Metadata filters in queries (@kind @in @since @until @by @pages) and page
// numbers of PDF hits. Expected sets follow from the files made here.
#include <doctest/doctest.h>

#include <algorithm>

#include "harness.h"
#include "make_files.h"

namespace {

using namespace lode::testing;

std::vector<std::string> sorted_ids(const std::string& index, const std::string& query) {
  auto ids = hit_ids(search(index, query));
  std::sort(ids.begin(), ids.end());
  return ids;
}

void make_lantern_tree(const Scratch& s) {
  s.write("papers/long.pdf", make_pdf({"lantern page one", "lantern two", "three", "four", "five"}, "Long",
                                      "Ada Brennan", "D:20200115000000Z"));
  s.write("papers/short.pdf", make_pdf({"lantern single page"}, "Short", "Colm Doyle", "D:20211201000000Z"));
  s.write("web/a.html", "<title>A</title><p>lantern in a page</p>");
  s.write("mail/m.eml", "From: Nora <nora@example.org>\nSubject: Lantern\nDate: Wed, 10 Mar 2021 08:00:00 +0000\n\n"
                        "the lantern order\n");
  s.write("notes/n.txt", "lantern notes\n");
}

TEST_CASE("filters restrict matches by kind, folder, author, date and pages") {
  Scratch s;
  make_lantern_tree(s);
  index_tree(s.index(), {s.tree()});
  using V = std::vector<std::string>;
  CHECK(sorted_ids(s.index(), "lantern") == V{"mail/m.eml", "notes/n.txt", "papers/long.pdf", "papers/short.pdf", "web/a.html"});
  CHECK(sorted_ids(s.index(), "lantern @kind:pdf") == V{"papers/long.pdf", "papers/short.pdf"});
  CHECK(sorted_ids(s.index(), "lantern @kind:html,email") == V{"mail/m.eml", "web/a.html"});
  CHECK(sorted_ids(s.index(), "lantern @in:papers/") == V{"papers/long.pdf", "papers/short.pdf"});
  CHECK(sorted_ids(s.index(), "lantern @in:web @in:notes") == V{"notes/n.txt", "web/a.html"});
  CHECK(sorted_ids(s.index(), "lantern @in:" + s.file("mail")) == V{"mail/m.eml"});
  CHECK(sorted_ids(s.index(), "lantern @by:BRENNAN") == V{"papers/long.pdf"});
  CHECK(sorted_ids(s.index(), "lantern @pages:2-") == V{"papers/long.pdf"});
  CHECK(sorted_ids(s.index(), "lantern @pages:1-1") == V{"papers/short.pdf"});
  // Document dates: long.pdf 2020-01-15, m.eml 2021-03-10, short.pdf 2021-12-01;
  // the other files carry today's mtime.
  CHECK(sorted_ids(s.index(), "lantern @until:2020") == V{"papers/long.pdf"});
  CHECK(sorted_ids(s.index(), "lantern @since:2021-03 @until:2021-03") == V{"mail/m.eml"});
  CHECK(sorted_ids(s.index(), "lantern @since:2021-03-10 @until:2021-12-01") == V{"mail/m.eml", "papers/short.pdf"});
  // Filters combine with required words.
  CHECK(sorted_ids(s.index(), "+single lantern @kind:pdf") == V{"papers/short.pdf"});
  CHECK(search(s.index(), "lantern @kind:docx").matched == 0);
}

TEST_CASE("bad filters are refused naming the item") {
  Scratch s;
  make_lantern_tree(s);
  index_tree(s.index(), {s.tree()});
  auto reader = lode::IndexReader::open(s.index());
  REQUIRE(reader.ok());
  auto searcher = lode::Searcher::create(**reader);
  REQUIRE(searcher.ok());
  for (const char* q : {"lantern @colour:red", "lantern @since:2021-13", "lantern @pages:x", "lantern @kind:"}) {
    CAPTURE(q);
    auto r = (*searcher)->search(q, {});
    REQUIRE_FALSE(r.ok());
    CHECK(r.status().code() == lode::Code::kInvalidArgument);
    CHECK(r.status().message().find(std::string(q).substr(8)) != std::string::npos);
  }
}

TEST_CASE("a PDF hit names the page its snippet comes from") {
  Scratch s;
  s.write("book.pdf", make_pdf({"opening words about the coast", "middle page on the reef and tides",
                                "closing remarks about quartermaster duties\nand the quartermaster log"}));
  index_tree(s.index(), {s.tree()});
  auto r = search(s.index(), "quartermaster");
  REQUIRE(r.hits.size() == 1);
  CHECK(r.hits[0].page == 3);
  CHECK(r.hits[0].snippet.text.find("quartermaster") != std::string::npos);
  CHECK(r.hits[0].snippet.text.find("reef") == std::string::npos);
  r = search(s.index(), "reef");
  REQUIRE(r.hits.size() == 1);
  CHECK(r.hits[0].page == 2);
  CHECK(r.hits[0].snippet.text.find("coast") == std::string::npos);
  // The stored page map: page starts by word position and byte offset.
  auto reader = lode::IndexReader::open(s.index());
  auto scope = (*reader)->begin();
  auto pages = (*reader)->pages(1);
  REQUIRE(pages.ok());
  REQUIRE(pages->size() == 3);
  CHECK((*pages)[0].position == 0);
  CHECK((*pages)[1].position == 5);   // "opening words about the coast": 5 words (stopwords keep positions)
  CHECK((*pages)[2].position == 12);  // + "middle page on the reef and tides": 7 words
  // A text file has no pages.
  s.write("plain.txt", "reef notes\n");
  index_tree(s.index(), {s.tree()});
  r = search(s.index(), "notes");
  REQUIRE(r.hits.size() == 1);
  CHECK(r.hits[0].page == 0);
}

}  // namespace
