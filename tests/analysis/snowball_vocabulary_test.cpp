// Snowball stemmers against every word of the published sample vocabularies.
// Source: Debian package snowball-data (0+20210120), files
// /usr/share/snowball/data/<language>/voc.txt and output.txt (or .gz): each
// line of output.txt is the stem of the same line of voc.txt. Missing data is
// a failure, not a skip: CI installs snowball-data.
//
// Every algorithm of libstemmer 2.2.0 was measured to agree on every word of
// the 2021-01-20 snapshot (0 mismatches in 29 languages), so none is left out.
#include <doctest/doctest.h>

#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <string>
#include <sys/stat.h>
#include <vector>

#include "lode/analysis.h"

namespace {

const std::string kDataDir = "/usr/share/snowball/data/";

bool exists(const std::string& path) {
  struct stat st {};
  return ::stat(path.c_str(), &st) == 0;
}

// Reads `path`, or `path`.gz through gzip -dc, one line at a time (the Arabic
// vocabulary has 9 million lines: stream, do not hold them).
class LineReader {
 public:
  explicit LineReader(const std::string& path) {
    if (exists(path)) {
      file_ = std::fopen(path.c_str(), "rb");
    } else if (exists(path + ".gz")) {
      file_ = ::popen(("gzip -dc '" + path + ".gz'").c_str(), "r");
      piped_ = true;
    }
  }
  ~LineReader() { (void)close(); }
  LineReader(const LineReader&) = delete;
  LineReader& operator=(const LineReader&) = delete;

  bool is_open() const { return file_ != nullptr; }
  // Next line without its newline; false at the end.
  bool next(std::string& line) {
    if (file_ == nullptr) return false;
    const ssize_t n = ::getline(&buf_, &cap_, file_);
    if (n < 0) return false;
    line.assign(buf_, static_cast<std::size_t>(n));
    if (!line.empty() && line.back() == '\n') line.pop_back();
    return true;
  }
  // True when the file (or gzip) ended cleanly.
  bool close() {
    bool ok = true;
    if (file_ != nullptr) ok = piped_ ? ::pclose(file_) == 0 : std::fclose(file_) == 0;
    file_ = nullptr;
    std::free(buf_);
    buf_ = nullptr;
    return ok;
  }

 private:
  std::FILE* file_ = nullptr;
  bool piped_ = false;
  char* buf_ = nullptr;
  std::size_t cap_ = 0;
};

void check_vocabulary(const std::string& language) {
  const std::string dir = kDataDir + language + "/";
  LineReader voc(dir + "voc.txt");
  LineReader out(dir + "output.txt");
  REQUIRE_MESSAGE(voc.is_open(), "missing " << dir << "voc.txt[.gz] (install snowball-data)");
  REQUIRE_MESSAGE(out.is_open(), "missing " << dir << "output.txt[.gz] (install snowball-data)");

  lode::AnalyzerOptions options;
  options.language = language;
  auto analyzer = lode::Analyzer::create(options);
  REQUIRE(analyzer.ok());
  std::size_t words = 0;
  std::size_t mismatches = 0;
  std::string word;
  std::string want;
  bool more_voc;
  bool more_out;
  while ((more_voc = voc.next(word)) & (more_out = out.next(want))) {
    ++words;
    const std::string got = analyzer.value()->stem(word);
    if (got != want && ++mismatches <= 5) {
      MESSAGE(language << ": " << word << " -> " << got << ", expected " << want);
    }
  }
  CHECK_MESSAGE(more_voc == more_out, dir << "voc and output differ in length");
  CHECK(voc.close());
  CHECK(out.close());
  CHECK(words > 1000);
  CHECK(mismatches == 0);
}

}  // namespace

// The whole pipeline on a vocabulary: words that segment to themselves and
// fold to themselves, joined by spaces, must analyze to output.txt's stems
// (stopwords off). This runs segmentation, folding, the stem cache and the
// stemmer together over tens of thousands of real words.
void check_pipeline(const std::string& language) {
  const std::string dir = kDataDir + language + "/";
  LineReader voc(dir + "voc.txt");
  LineReader out(dir + "output.txt");
  REQUIRE(voc.is_open());
  REQUIRE(out.is_open());
  lode::AnalyzerOptions options;
  options.language = language;
  options.stopwords = false;
  auto analyzer = lode::Analyzer::create(options);
  REQUIRE(analyzer.ok());
  lode::Analyzer& a = *analyzer.value();

  std::string text;
  std::vector<std::string> want;
  std::string word;
  std::string stem;
  while (voc.next(word) && out.next(stem)) {
    const auto w = a.words(word);
    if (w.size() == 1 && w[0].term == word && word.size() <= lode::Analyzer::kMaxWordBytes) {
      text += word;
      text += ' ';
      want.push_back(stem);
    }
  }
  REQUIRE(want.size() > 10000);
  // Twice: the second pass is served from the stem cache.
  for (int pass = 0; pass < 2; ++pass) {
    const auto r = a.analyze(text);
    REQUIRE(r.tokens.size() == want.size());
    std::size_t mismatches = 0;
    for (std::size_t i = 0; i < want.size(); ++i) mismatches += r.tokens[i].term != want[i];
    CHECK(mismatches == 0);
  }
}

#define LODE_SNOWBALL_CASE(lang) \
  TEST_CASE("snowball vocabulary: " lang) { check_vocabulary(lang); }

LODE_SNOWBALL_CASE("arabic")
LODE_SNOWBALL_CASE("armenian")
LODE_SNOWBALL_CASE("basque")
LODE_SNOWBALL_CASE("catalan")
LODE_SNOWBALL_CASE("danish")
LODE_SNOWBALL_CASE("dutch")
LODE_SNOWBALL_CASE("english")
LODE_SNOWBALL_CASE("finnish")
LODE_SNOWBALL_CASE("french")
LODE_SNOWBALL_CASE("german")
LODE_SNOWBALL_CASE("greek")
LODE_SNOWBALL_CASE("hindi")
LODE_SNOWBALL_CASE("hungarian")
LODE_SNOWBALL_CASE("indonesian")
LODE_SNOWBALL_CASE("irish")
LODE_SNOWBALL_CASE("italian")
LODE_SNOWBALL_CASE("lithuanian")
LODE_SNOWBALL_CASE("nepali")
LODE_SNOWBALL_CASE("norwegian")
LODE_SNOWBALL_CASE("porter")
LODE_SNOWBALL_CASE("portuguese")
LODE_SNOWBALL_CASE("romanian")
LODE_SNOWBALL_CASE("russian")
LODE_SNOWBALL_CASE("serbian")
LODE_SNOWBALL_CASE("spanish")
LODE_SNOWBALL_CASE("swedish")
LODE_SNOWBALL_CASE("tamil")
LODE_SNOWBALL_CASE("turkish")
LODE_SNOWBALL_CASE("yiddish")

TEST_CASE("snowball pipeline: english") { check_pipeline("english"); }
TEST_CASE("snowball pipeline: french") { check_pipeline("french"); }
TEST_CASE("snowball pipeline: german") { check_pipeline("german"); }
TEST_CASE("snowball pipeline: spanish") { check_pipeline("spanish"); }
TEST_CASE("snowball pipeline: russian") { check_pipeline("russian"); }

TEST_CASE("snowball vocabulary: every stemmer language is covered above") {
  // A libstemmer upgrade that adds a language should add its vocabulary here.
  std::size_t covered = 0;
  for (const std::string& l : lode::stemmer_languages()) {
    if (l == "none") continue;
    CAPTURE(l);
    const bool has_data = exists(kDataDir + l + "/voc.txt") || exists(kDataDir + l + "/voc.txt.gz");
    CHECK(has_data);
    ++covered;
  }
  CHECK(covered == 29);
}
