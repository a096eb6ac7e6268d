// bench/vocab.h — a synthetic English-like vocabulary with Zipf frequencies.
//
// Ranks 0..299 are common English words (function words first, then frequent
// verbs, nouns and adjectives; the list and its rough order are recalled from
// memory, not copied from any text), so stopword removal removes what it
// removes in real prose. Every later rank is an invented lemma built from
// English-looking syllables (sometimes with a derivational ending: -tion,
// -ment, -ness...), with inflected forms (-s/-es, -ed, -ing, -er, -est, -ly,
// with English spelling rules: doubled consonants, dropped e, y -> i) so the
// Snowball stemmer does real work. A lemma is drawn with probability
// proportional to 1 / (rank + q)^s (Zipf-Mandelbrot), then one of its forms.
//
// Everything follows from the seed: the same seed gives the same vocabulary
// on every platform (see rng.h).
//
// Thread safety: const methods are safe from any thread; sampling takes the
// caller's Rng.
#pragma once

#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "rng.h"

namespace lode::bench {

enum class WordClass : std::uint8_t { kCommon, kNoun, kVerb, kAdjective };

struct Lemma {
  WordClass cls = WordClass::kCommon;
  std::vector<std::string> forms;  // forms[0] is the base form
  std::vector<double> form_cdf;    // cumulative probability of each form
};

struct VocabularyOptions {
  std::uint64_t seed = 42;
  // Distinct surface forms to reach (common words included). Default 50,000.
  std::size_t surface_words = 50'000;
  // Zipf-Mandelbrot law over lemma ranks r = 1, 2, ...: p(r) ~ 1 / (r + q)^s.
  // s = 1 is Zipf's classic exponent for English; the offset q = 1 flattens
  // the head so "the" takes ~6% of running words (as in English prose) and the
  // 300 common words ~57%, instead of ~10% and ~60% with plain Zipf.
  double zipf_s = 1.0;
  double zipf_q = 1.0;
  // Share of invented lemmas that carry an accented letter (é, ö, ï...), so the
  // non-ASCII segmentation path runs as it would on loanwords. 0 = pure ASCII.
  double accented_share = 0.01;
};

class Vocabulary {
 public:
  static constexpr std::size_t kCommonWords = 300;

  explicit Vocabulary(const VocabularyOptions& options);

  std::size_t lemma_count() const { return lemmas_.size(); }
  std::size_t surface_count() const { return surface_count_; }
  const Lemma& lemma(std::size_t rank) const { return lemmas_[rank]; }
  // Probability of drawing lemma `rank`.
  double probability(std::size_t rank) const;

  std::size_t sample_rank(Rng& rng) const;
  std::string_view sample_form(std::size_t rank, Rng& rng) const;
  std::string_view sample(Rng& rng) const { return sample_form(sample_rank(rng), rng); }

  // A fresh invented word outside the vocabulary: the long tail of names,
  // rare words and typos that makes real vocabularies grow with corpus size.
  static std::string invent_word(Rng& rng, double accented_share);

 private:
  std::vector<Lemma> lemmas_;
  std::vector<double> cdf_;  // cumulative Zipf probability by rank
  std::size_t surface_count_ = 0;
};

}  // namespace lode::bench
