// lode/analysis.h — turning text into index terms.
//
// Pipeline, applied identically at index and query time:
//   UTF-8 check (bad bytes -> U+FFFD) -> word segmentation (ICU UAX #29 rules; an ASCII
//   fast path yields identical tokens) -> NFKC case folding -> stopword test ->
//   Snowball stemming.
// Positions count every word, stopwords included, so phrase gaps survive removal.
//
// Thread safety: an Analyzer is NOT thread-safe (the Snowball stemmer and the
// stem cache are per instance). Create one per thread; creation is cheap.
#pragma once

#include <cstdint>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "lode/status.h"

namespace lode {

// --- UTF-8 -------------------------------------------------------------------

struct Utf8Repair {
  std::string text;          // valid UTF-8; each invalid sequence replaced by U+FFFD
  std::size_t replaced = 0;  // number of replacements made (0: input was valid)
  std::size_t first_bad_offset = 0;  // byte offset of the first bad sequence in the input
};

// Returns the input as valid UTF-8. Never fails. Overlong forms, surrogates,
// code points above U+10FFFF and truncated sequences count as invalid.
Utf8Repair repair_utf8(std::string_view bytes);

// True when `bytes` is valid UTF-8 (same rules as repair_utf8).
bool is_valid_utf8(std::string_view bytes);

// --- Analyzer ------------------------------------------------------------------

struct AnalyzerOptions {
  // Snowball algorithm name as libstemmer knows it ("english", "french", ...),
  // or "none" for no stemming. Default: english.
  std::string language = "english";
  // Remove the language's stopwords (from the Snowball project's lists, BSD
  // licence; see docs/stopwords.md). Languages without a list remove nothing.
  bool stopwords = true;
};

struct Token {
  std::string term;        // folded, stemmed form: the index term
  std::uint32_t position;  // word number within the analyzed text (0-based + offset)
  std::uint32_t begin;     // byte offset of the word in the input text
  std::uint32_t end;       // byte offset one past the word
};

class Analyzer {
 public:
  // Fails with InvalidArgument naming the language when libstemmer lacks it.
  static Result<std::unique_ptr<Analyzer>> create(const AnalyzerOptions& options);
  ~Analyzer();
  Analyzer(const Analyzer&) = delete;
  Analyzer& operator=(const Analyzer&) = delete;

  const AnalyzerOptions& options() const;

  struct Analyzed {
    std::vector<Token> tokens;     // index terms in text order
    std::uint32_t word_count = 0;  // positions taken: every word, stopwords included
  };
  // Index terms of `text` (REQUIRES: valid UTF-8, e.g. from repair_utf8).
  // Positions start at `first_position`. Words longer than kMaxWordBytes bytes
  // after folding are dropped (they still take a position).
  Analyzed analyze(std::string_view text, std::uint32_t first_position = 0);

  // Folded, unstemmed words with offsets: the segmentation + folding steps
  // alone, no stopword removal (used by tests and by snippets).
  std::vector<Token> words(std::string_view text, std::uint32_t first_position = 0) const;

  // The stem of one already-folded word ("none" language: the word itself).
  std::string stem(std::string_view folded_word);

  // True when the folded word is a stopword for this analyzer's options.
  bool is_stopword(std::string_view folded_word) const;

  static constexpr std::size_t kMaxWordBytes = 64;

 private:
  struct Impl;
  explicit Analyzer(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

// Names of the Snowball algorithms this build can use (libstemmer's list, UTF-8
// ones), sorted, plus "none".
std::vector<std::string> stemmer_languages();

// Segments `text` with ICU only (no ASCII fast path), folds each word with NFKC
// case folding: the reference the fast path must match. Exposed for tests.
std::vector<Token> words_icu_reference(std::string_view text);

}  // namespace lode
