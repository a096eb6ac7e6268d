// Every format: unique words find exactly their document; titles, authors,
// dates and page counts land in the right fields. All files are invented
// here (see make_files.h); expected values come from the files themselves.
#include <doctest/doctest.h>

#include "harness.h"
#include "make_files.h"

namespace {

using namespace lode::testing;

// A tree with one file per format, each holding a word no other file has.
void make_archive(const Scratch& s) {
  s.write("papers/tides.pdf", make_pdf({"Harbour survey of quillwort beds", "Second page mentions zephyrine currents",
                                         "Third page about marlinspike knots"},
                                        "Tidal Survey Report", "Ada Brennan", "D:20210304120000Z"));
  s.write("web/lamp.html",
          "<!doctype html><html><head><title>Lamp Room Notes</title><style>.x{color:red}</style>"
          "<script>var hiddenscriptword = 1;</script></head><body><nav>navbarword menu</nav>"
          "<h1>Keeper&#39;s log</h1><p>The lens was polished with &quot;rottenstone&quot; paste.</p>"
          "<footer>footerword</footer></body></html>");
  s.write("office/report.docx", make_docx(docx_paragraph("Inventory of gannetry supplies") +
                                              docx_paragraph("Second paragraph"),
                                          "Supply Inventory", "Colm Doyle"));
  s.write("office/minutes.odt", make_odt("<text:h>Meeting</text:h><text:p>Discussion of foghorn "
                                         "<text:span>bellwether</text:span> tuning</text:p>",
                                         "Harbour Minutes", "Brid Kelly"));
  s.write("books/keeper.epub",
          make_epub({"<html><head><title>One</title></head><body><p>Chapter about stormpetrel nests</p></body></html>",
                     "<html><body><p>Chapter about kittiwake cliffs</p></body></html>"},
                    "The Keeper's Year", "Eoin Walsh"));
  s.write("mail/one.eml",
          "From: Nora Quinn <nora@example.org>\r\nTo: Liam Roe <liam@example.org>\r\n"
          "Subject: =?UTF-8?Q?Caf=C3=A9_supplies?=\r\nDate: Tue, 02 Mar 2021 10:00:00 +0000\r\n"
          "MIME-Version: 1.0\r\nContent-Type: multipart/mixed; boundary=\"b1\"\r\n\r\n"
          "--b1\r\nContent-Type: text/plain; charset=utf-8\r\nContent-Transfer-Encoding: quoted-printable\r\n\r\n"
          "Please order more wick=\r\ntrimmers.\r\n"
          "--b1\r\nContent-Type: application/pdf\r\nContent-Disposition: attachment; filename=\"invoice.pdf\"\r\n"
          "Content-Transfer-Encoding: base64\r\n\r\nJVBERi0=\r\n--b1--\r\n");
  s.write("mail/archive.mbox",
          "From alice@example.org Mon Jan  4 09:00:00 2021\nFrom: Alice <alice@example.org>\n"
          "Subject: First message\nDate: Mon, 04 Jan 2021 09:00:00 +0000\n\nAbout the oilskin order.\n\n"
          "From bob@example.org Tue Jan  5 09:00:00 2021\nFrom: Bob <bob@example.org>\n"
          "Subject: Second message\nDate: Tue, 05 Jan 2021 09:00:00 +0000\nContent-Transfer-Encoding: base64\n\n"
          "QWJvdXQgdGhlIGJlYWNvbmZpcmUgcm90YS4K\n");  // "About the beaconfire rota."
  s.write("old/latin1.txt", "Le phare de Kerbrat\nLa lanterne \xE9tait \xE9teinte pr\xE8s du r\xE9" "cif "
                            "brisants sous la temp\xEAte.\n");
  s.write("old/koi8.txt", "\xf0\xd2\xc9\xd7\xc5\xd4 \xcd\xc9\xd2! \xfc\xd4\xcf \xd4\xc5\xd3\xd4\xcf\xd7\xd9\xca "
                          "\xd4\xc5\xcb\xd3\xd4 \xce\xc1 \xd2\xd5\xd3\xd3\xcb\xcf\xcd \xd1\xda\xd9\xcb\xc5.\n");
  s.write("packed/log.html.gz", gzip_bytes("<html><head><title>Packed Log</title></head><body><p>Entry on "
                                           "sandpiper counts</p></body></html>"));
  s.write("packed/notes.txt.gz", gzip_bytes("Compressed notes\nwhelk harvest figures\n"));
}

TEST_CASE("each format's unique word finds exactly its document") {
  Scratch s;
  make_archive(s);
  auto report = index_tree(s.index(), {s.tree()});
  CHECK(report.failed == 0);
  const std::vector<std::pair<std::string, std::string>> expect = {
      {"quillwort", "papers/tides.pdf"},   {"zephyrine", "papers/tides.pdf"},
      {"rottenstone", "web/lamp.html"},    {"gannetry", "office/report.docx"},
      {"bellwether", "office/minutes.odt"}, {"stormpetrel", "books/keeper.epub"},
      {"kittiwake", "books/keeper.epub"},  {"wicktrimmers", "mail/one.eml"},
      {"oilskin", "mail/archive.mbox#1"},  {"beaconfire", "mail/archive.mbox#2"},
      {"récif", "old/latin1.txt"},         {"sandpiper", "packed/log.html.gz"},
      {"whelk", "packed/notes.txt.gz"},    {"trimmers", ""}};
  for (auto& [word, id] : expect) {
    CAPTURE(word);
    auto ids = hit_ids(search(s.index(), word));
    if (id.empty()) CHECK(ids.empty());
    else CHECK(ids == std::vector<std::string>{id});
  }
  // ("wick=\r\ntrimmers" is a quoted-printable soft line break, RFC 2045
  // 6.7: one word, so "trimmers" alone finds nothing.)
  // Boilerplate and scripts are not indexed.
  for (const char* w : {"hiddenscriptword", "navbarword", "footerword"}) {
    CAPTURE(w);
    CHECK(search(s.index(), w).hits.empty());
  }
  // KOI8-R text: "Привет мир" (hello world) decoded to UTF-8.
  CHECK(hit_ids(search(s.index(), "привет")) == std::vector<std::string>{"old/koi8.txt"});
}

TEST_CASE("titles, authors, dates and pages land in their fields") {
  Scratch s;
  make_archive(s);
  index_tree(s.index(), {s.tree()});
  auto reader = lode::IndexReader::open(s.index());
  REQUIRE(reader.ok());
  auto scope = (*reader)->begin();
  REQUIRE(scope.ok());
  struct Want {
    const char* id;
    const char* kind;
    const char* title;
    const char* author;
    std::int64_t date;  // seconds since the epoch, 0 = not checked
    std::uint32_t pages;
  };
  // Dates: 2021-03-04 12:00:00 UTC = 1614859200; 2019-05-06 07:08:09 UTC =
  // 1557126489; 2020-02-03 04:05:06 UTC = 1580702706; 2021-03-02 10:00:00 UTC
  // = 1614679200 (computed with GNU date -u -d ... +%s).
  const Want wants[] = {
      {"papers/tides.pdf", "pdf", "Tidal Survey Report", "Ada Brennan", 1614859200, 3},
      {"web/lamp.html", "html", "Lamp Room Notes", "", 0, 0},
      {"office/report.docx", "docx", "Supply Inventory", "Colm Doyle", 1557126489, 0},
      {"office/minutes.odt", "odt", "Harbour Minutes", "Brid Kelly", 1580702706, 0},
      {"books/keeper.epub", "epub", "The Keeper's Year", "Eoin Walsh", 0, 0},
      {"mail/one.eml", "email", "Café supplies", "Nora Quinn <nora@example.org>", 1614679200, 0},
      {"mail/archive.mbox#2", "email", "Second message", "Bob <bob@example.org>", 0, 0},
      {"old/latin1.txt", "text", "Le phare de Kerbrat", "", 0, 0},
      {"packed/log.html.gz", "html", "Packed Log", "", 0, 0},
  };
  for (const Want& w : wants) {
    CAPTURE(w.id);
    auto id = (*reader)->find_external(w.id);
    REQUIRE_MESSAGE(id.ok(), id.status().to_string());
    auto info = (*reader)->document(*id);
    REQUIRE(info.ok());
    CHECK(info->kind == w.kind);
    CHECK(info->title == w.title);
    CHECK(info->author == w.author);
    if (w.date != 0) CHECK(info->date == w.date);
    CHECK(info->pages == w.pages);
  }
  // The mail body lists its attachment; From/To are searchable.
  // (UAX #29 keeps "invoice.pdf" one word.)
  CHECK(hit_ids(search(s.index(), "invoice.pdf")) == std::vector<std::string>{"mail/one.eml"});
  CHECK(hit_ids(search(s.index(), "liam")) == std::vector<std::string>{"mail/one.eml"});
}

TEST_CASE("a legacy-encoded file says which charset was assumed") {
  Scratch s;
  const auto path = s.write("latin1.txt", "La lanterne \xE9tait \xE9teinte pr\xE8s du r\xE9" "cif sous la temp\xEAte.\n");
  auto r = lode::read_file(path, {});
  REQUIRE(r.ok());
  REQUIRE(r->documents.size() == 1);
  CHECK(r->documents[0].body == "La lanterne était éteinte près du récif sous la tempête.\n");
  REQUIRE(r->warnings.size() == 1);
  CHECK(r->warnings[0].rfind("not UTF-8: decoded as ISO-8859-1", 0) == 0);
}

TEST_CASE("HTML honours a declared charset") {
  Scratch s;
  const auto path = s.write("w.html", "<html><head><meta charset=\"windows-1252\"><title>Caf\xE9</title></head>"
                                      "<body><p>Na\xEFve \x93quotes\x94</p></body></html>");
  auto r = lode::read_file(path, {});
  REQUIRE(r.ok());
  REQUIRE(r->documents.size() == 1);
  CHECK(r->documents[0].title == "Café");
  CHECK(r->documents[0].body.find("Naïve \u201Cquotes\u201D") != std::string::npos);
}

TEST_CASE("a PDF's pages are separated and their starts recorded") {
  Scratch s;
  const auto path = s.write("p.pdf", make_pdf({"alpha one", "beta two", "gamma three"}));
  auto r = lode::read_file(path, {});
  REQUIRE_MESSAGE(r.ok(), r.status().to_string());
  REQUIRE(r->documents.size() == 1);
  const auto& d = r->documents[0];
  CHECK(d.pages == 3);
  REQUIRE(d.page_starts.size() == 3);
  CHECK(d.page_starts[0] == 0);
  for (std::size_t i = 0; i < 3; ++i) {
    const std::size_t end = i + 1 < 3 ? d.page_starts[i + 1] : d.body.size();
    const std::string page = d.body.substr(d.page_starts[i], end - d.page_starts[i]);
    CAPTURE(page);
    CHECK(page.find(std::vector<std::string>{"alpha", "beta", "gamma"}[i]) != std::string::npos);
  }
  // No information dictionary: the title is the first line.
  CHECK(d.title == "alpha one");
}

}  // namespace
