// The Analyzer pipeline: stopwords, long words, languages, positions.
#include <doctest/doctest.h>

#include <algorithm>
#include <random>
#include <string>
#include <vector>

#include "lode/analysis.h"

namespace {

std::unique_ptr<lode::Analyzer> make(const std::string& language, bool stopwords = true) {
  lode::AnalyzerOptions o;
  o.language = language;
  o.stopwords = stopwords;
  auto a = lode::Analyzer::create(o);
  REQUIRE(a.ok());
  return std::move(a).value();
}

}  // namespace

TEST_CASE("analyzer: stopwords are removed but keep their positions") {
  auto a = make("english");
  // "the", "of", "is", "an" are on the Snowball English list (docs/stopwords.md).
  const auto r = a->analyze("The Quick fox of Rome is an adder", 5);
  CHECK(r.word_count == 8);
  REQUIRE(r.tokens.size() == 4);
  CHECK(r.tokens[0].term == "quick");
  CHECK(r.tokens[0].position == 6);
  CHECK(r.tokens[1].term == "fox");
  CHECK(r.tokens[1].position == 7);
  CHECK(r.tokens[2].term == "rome");
  CHECK(r.tokens[2].position == 9);
  CHECK(r.tokens[3].term == "adder");  // Debian snowball-data english: adder -> adder
  CHECK(r.tokens[3].position == 12);
  CHECK(r.tokens[3].begin == 28);
  CHECK(r.tokens[3].end == 33);
}

TEST_CASE("analyzer: stopwords are matched on the folded, unstemmed word") {
  auto en = make("english");
  CHECK(en->is_stopword("the"));
  CHECK(en->is_stopword("don't"));     // apostrophe forms are on the list
  CHECK_FALSE(en->is_stopword("us"));  // commented out in the Snowball list (US = United States)
  CHECK_FALSE(en->is_stopword("The"));  // callers pass folded words
  CHECK(en->analyze("THE DON'T").tokens.empty());
  // "daß" is on the published German list; folding turns it into "dass".
  auto de = make("german");
  CHECK(de->is_stopword("dass"));
  CHECK(de->analyze("Daß").tokens.empty());
  // Stopword removal off: every word is a term.
  auto all = make("english", false);
  CHECK_FALSE(all->is_stopword("the"));
  CHECK(all->analyze("the end").tokens.size() == 2);
}

TEST_CASE("analyzer: variant algorithms use their language's list") {
  CHECK(make("porter")->is_stopword("the"));
  CHECK_FALSE(make("arabic")->is_stopword("the"));  // no Snowball list: nothing removed
  CHECK(make("russian")->is_stopword("опять"));     // corrected spelling (docs/stopwords.md)
  CHECK(make("portuguese")->is_stopword("não"));
}

TEST_CASE("analyzer: stemming follows the language") {
  auto en = make("english");
  CHECK(en->stem("running") == "run");           // Debian snowball-data english: running -> run
  CHECK(en->stem("generously") == "generous");   // ...generously -> generous
  const auto r = en->analyze("Running CONNECTIONS");
  REQUIRE(r.tokens.size() == 2);
  CHECK(r.tokens[0].term == "run");
  CHECK(r.tokens[1].term == "connect");          // ...connections -> connect
  auto fr = make("french");
  CHECK(fr->stem("continuellement") == "continuel");  // snowballstem.org French sample table
}

TEST_CASE("analyzer: language none folds but does not stem") {
  auto a = make("none");
  CHECK(a->stem("running") == "running");
  const auto r = a->analyze("The Running");
  REQUIRE(r.tokens.size() == 2);  // no list for "none": "the" stays
  CHECK(r.tokens[0].term == "the");
  CHECK(r.tokens[1].term == "running");
}

TEST_CASE("analyzer: unknown languages are an InvalidArgument naming them") {
  for (const char* bad : {"klingon", "en", "English", ""}) {
    lode::AnalyzerOptions o;
    o.language = bad;
    auto a = lode::Analyzer::create(o);
    CAPTURE(bad);
    REQUIRE_FALSE(a.ok());
    CHECK(a.status().code() == lode::Code::kInvalidArgument);
    CHECK(a.status().message().find("'" + std::string(bad) + "'") != std::string::npos);
  }
}

TEST_CASE("analyzer: stemmer_languages lists libstemmer's algorithms and none") {
  const auto langs = lode::stemmer_languages();
  CHECK(std::is_sorted(langs.begin(), langs.end()));
  for (const char* l : {"english", "french", "german", "russian", "spanish", "porter", "none"}) {
    CAPTURE(l);
    CHECK(std::find(langs.begin(), langs.end(), l) != langs.end());
  }
  for (const auto& l : langs) {
    lode::AnalyzerOptions o;
    o.language = l;
    CAPTURE(l);
    CHECK(lode::Analyzer::create(o).ok());
  }
}

TEST_CASE("analyzer: words longer than kMaxWordBytes after folding are dropped") {
  auto a = make("none");
  const std::string max_word(lode::Analyzer::kMaxWordBytes, 'x');
  const std::string too_long(lode::Analyzer::kMaxWordBytes + 1, 'y');
  auto r = a->analyze("before " + too_long + " " + max_word + " after");
  CHECK(r.word_count == 4);
  REQUIRE(r.tokens.size() == 3);
  CHECK(r.tokens[0].term == "before");
  CHECK(r.tokens[1].term == max_word);
  CHECK(r.tokens[1].position == 2);
  CHECK(r.tokens[2].position == 3);
  // 30 x U+01C6 is 60 bytes, but folds to 30 x (0064 017E), 90 bytes
  // (UnicodeData.txt: 01C6 <compat> 0064 017E), so it is dropped.
  std::string dz;
  for (int i = 0; i < 30; ++i) dz += "\xC7\x86";
  r = a->analyze("a " + dz + " b");
  CHECK(r.word_count == 3);
  REQUIRE(r.tokens.size() == 2);
  CHECK(r.tokens[1].position == 2);
  // words() is segmentation + folding only: it keeps them.
  CHECK(a->words(too_long).size() == 1);
}

TEST_CASE("analyzer: a word that folds to nothing takes a position but gives no term") {
  auto a = make("none");
  const auto r = a->analyze("a \xE3\x85\xA4 b");  // U+3164 is a letter and Default_Ignorable
  CHECK(r.word_count == 3);
  REQUIRE(r.tokens.size() == 2);
  CHECK(r.tokens[1].position == 2);
}

TEST_CASE("analyzer: results do not depend on the stem cache") {
  auto a = make("english");
  const std::string text = "Stemming dominates indexing; caches of stems are cleared when full.";
  const auto first = a->analyze(text);
  // More distinct words than the cache holds (common practice bound: 100k).
  std::mt19937 rng(3);
  std::string filler;
  for (int i = 0; i < 120000; ++i) {
    filler += "w" + std::to_string(rng()) + "ing ";
    if (filler.size() > 100000) {
      (void)a->analyze(filler);
      filler.clear();
    }
  }
  const auto again = a->analyze(text);
  REQUIRE(first.tokens.size() == again.tokens.size());
  for (std::size_t i = 0; i < first.tokens.size(); ++i) CHECK(first.tokens[i].term == again.tokens[i].term);
  CHECK(a->stem("connections") == "connect");  // Debian snowball-data english
}

TEST_CASE("analyzer: ill-formed UTF-8 input does not crash") {
  // REQUIRES valid UTF-8, but a caller's mistake must not crash.
  auto a = make("english");
  const std::string bad = "abc \xFF\xFE caf\xC3 \xE2\x82 d\xED\xA0\x80x";
  const auto r = a->analyze(bad);
  CHECK(r.word_count >= 2);
  const auto fixed = lode::repair_utf8(bad);
  CHECK(a->analyze(fixed.text).word_count >= 2);
}
