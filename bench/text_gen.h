// bench/text_gen.h — English-like documents from a Vocabulary.
//
// A document is a title line, a blank line, then paragraphs of 2-7 sentences
// of 5-28 words, wrapped at 72 columns, paragraphs separated by a blank line.
// Sentences start with a capital and end in . ? or !; commas, numbers,
// possessives ('s), the odd capitalised name, em dashes (U+2014, the common
// non-ASCII character of English prose) and freshly invented words (the long
// tail that makes real vocabularies grow with corpus size) are sprinkled in at
// the rates of TextOptions. Every choice comes from the caller's Rng.
//
// Thread safety: const after construction; one Rng per thread.
#pragma once

#include <cstddef>
#include <string>

#include "rng.h"
#include "vocab.h"

namespace lode::bench {

struct TextOptions {
  double novel_rate = 0.003;   // words invented on the spot (names, rare words, typos)
  double number_rate = 0.006;  // numbers: years, counts, decimals
  double comma_rate = 0.07;    // a comma after a word (not the last)
  double dash_rate = 0.002;    // " — " between two words (0 with --ascii)
  double name_rate = 0.01;     // an invented word capitalised mid-sentence
  double possessive_rate = 0.01;  // "'s" after a noun
  double accented_share = 0.01;   // accented letters in novel words (0 with --ascii)
  std::size_t wrap_columns = 72;
};

class TextGenerator {
 public:
  TextGenerator(const Vocabulary& vocab, const TextOptions& options) : vocab_(vocab), opt_(options) {}

  // Appends one document of at least `target_bytes` bytes (it ends at the
  // first paragraph end past the target) to `out`.
  void document(std::size_t target_bytes, Rng& rng, std::string& out) const;

 private:
  void title(Rng& rng, std::string& out) const;
  void sentence(Rng& rng, std::string& out) const;
  void word(Rng& rng, std::string& out) const;
  void wrap_into(const std::string& paragraph, std::string& out) const;

  const Vocabulary& vocab_;
  TextOptions opt_;
};

}  // namespace lode::bench
