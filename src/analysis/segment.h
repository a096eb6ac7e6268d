// segment.h — word segmentation and folding (private to src/analysis).
//
// Words are the UAX #29 word segments that ICU marks as word-like (rule status
// >= UBRK_WORD_NONE_LIMIT: letters, numbers, kana, ideographs), each folded with
// NFKC case folding. Two implementations must agree token for token:
//   * IcuWords: ICU's word BreakIterator (root locale) over UTF-8 text;
//   * ascii_words: a hand-written scanner of the same rules restricted to ASCII.
// segment() runs the scanner over ASCII stretches and ICU over the rest,
// cutting the text only at "safe boundaries" where UAX #29 always breaks and
// no rule looks across (see is_safe_boundary), so the cut never changes a word.
//
// Thread safety: an IcuWords is used by one thread at a time.
#pragma once

#include <unicode/brkiter.h>
#include <unicode/utext.h>

#include <cstddef>
#include <memory>
#include <string>
#include <string_view>

#include "lode/status.h"

namespace lode::analysis {

// Receives every word-like segment, in text order.
class WordSink {
 public:
  virtual ~WordSink() = default;
  // `folded` is the NFKC case folded word; it can be empty (a word made only of
  // default-ignorable letters such as U+3164), which still counts as a word.
  // [begin, end) are the word's byte offsets in the text given to segment().
  virtual void word(std::string_view folded, std::size_t begin, std::size_t end) = 0;
};

// NFKC case folding (ICU Normalizer2 "nfkc_cf") of UTF-8 `in` into `out`.
// Pure ASCII takes a lower-casing shortcut with the same result.
void fold(std::string_view in, std::string& out);

// ICU word segmentation of a text stretch.
class IcuWords {
 public:
  // Fails (Unsupported) when ICU cannot build the word break iterator.
  static Result<std::unique_ptr<IcuWords>> create();
  ~IcuWords();
  IcuWords(const IcuWords&) = delete;
  IcuWords& operator=(const IcuWords&) = delete;

  // Segments text[from, to) as though it were the whole text; offsets passed
  // to the sink are relative to `text`. REQUIRES: from <= to <= text.size().
  void run(std::string_view text, std::size_t from, std::size_t to, WordSink& sink);

 private:
  explicit IcuWords(std::unique_ptr<icu::BreakIterator> bi) : bi_(std::move(bi)) {}
  std::unique_ptr<icu::BreakIterator> bi_;
  UText* ut_ = nullptr;  // reopened on each run; owned
  std::string folded_;   // scratch
};

// True when UAX #29 (ICU root rules) always puts a word boundary at byte `b`
// and no rule looks across it: text[b-1] and text[b] are ASCII, text[b-1] is
// white space or punctuation that no joining rule uses, and the pair is not
// CR LF or two spaces. REQUIRES: b <= text.size().
bool is_safe_boundary(std::string_view text, std::size_t b);

// The ASCII fast path: words of text[from, to) as though it were the whole
// text. REQUIRES: text[from, to) is ASCII. `scratch` is reused storage.
void ascii_words(std::string_view text, std::size_t from, std::size_t to, WordSink& sink,
                 std::string& scratch);

// Words of the whole text: ascii_words on ASCII stretches, `icu` elsewhere.
void segment(std::string_view text, IcuWords& icu, WordSink& sink, std::string& scratch);

}  // namespace lode::analysis
