// The vocabulary: common words, invented lemmas and Zipf sampling (see vocab.h).
#include "vocab.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <string_view>
#include <unordered_set>

#include "morphology.h"

namespace lode::bench {
namespace {

// 300 frequent English words in rough frequency order: function words, then
// frequent content words. Recalled from memory (approximate order), not taken
// from any text or published list. Most of the Snowball English stopwords
// are here, so stopword removal drops about as much as in real prose.
constexpr std::array<std::string_view, Vocabulary::kCommonWords> kCommon = {
    "the", "of", "and", "to", "a", "in", "that", "is", "was", "he", "for", "it",
    "with", "as", "his", "on", "be", "at", "by", "I", "this", "had", "not", "are",
    "but", "from", "or", "have", "an", "they", "which", "one", "you", "were", "her", "all",
    "she", "there", "would", "their", "we", "him", "been", "has", "when", "who", "will", "more",
    "no", "if", "out", "so", "said", "what", "up", "its", "about", "into", "than", "them",
    "can", "only", "other", "new", "some", "could", "time", "these", "two", "may", "then", "do",
    "first", "any", "my", "now", "such", "like", "our", "over", "man", "me", "even", "most",
    "made", "after", "also", "did", "many", "before", "must", "through", "back", "years", "where", "much",
    "your", "way", "well", "down", "should", "because", "each", "just", "those", "people", "how", "too",
    "little", "state", "good", "very", "make", "world", "still", "own", "see", "men", "work", "long",
    "get", "here", "between", "both", "life", "being", "under", "never", "day", "same", "another", "know",
    "while", "last", "might", "us", "great", "old", "year", "off", "come", "since", "against", "go",
    "came", "right", "used", "take", "three", "states", "himself", "few", "house", "use", "during", "without",
    "again", "place", "around", "however", "home", "small", "found", "thought", "went", "say", "part", "once",
    "general", "high", "upon", "school", "every", "don't", "does", "got", "left", "number", "course", "war",
    "until", "always", "away", "something", "fact", "though", "water", "less", "public", "put", "think", "almost",
    "hand", "enough", "far", "took", "head", "yet", "government", "system", "better", "set", "told", "nothing",
    "night", "end", "why", "called", "didn't", "eyes", "find", "going", "look", "asked", "later", "knew",
    "point", "next", "program", "city", "business", "give", "group", "toward", "young", "days", "let", "room",
    "side", "social", "present", "given", "several", "order", "national", "possible", "rather", "second", "face", "per",
    "among", "form", "important", "often", "things", "looked", "early", "white", "case", "become", "large", "big",
    "need", "four", "within", "felt", "children", "along", "saw", "best", "ever", "least", "power", "development",
    "light", "thing", "seemed", "family", "interest", "want", "members", "others", "mind", "country", "area", "done",
    "turned", "although", "open", "service", "certain", "kind", "problem", "began", "different", "door", "thus", "help",
    "sense", "means", "whole", "matter", "perhaps", "herself", "myself", "whom", "nor", "below", "further", "yourself"};

// Form probabilities, base form first (rules of thumb for English prose).
Lemma make_lemma(WordClass cls, const std::string& base) {
  Lemma l;
  l.cls = cls;
  std::vector<double> p;
  switch (cls) {
    case WordClass::kCommon:
      l.forms = {base};
      p = {1.0};
      break;
    case WordClass::kNoun:
      l.forms = {base, plural(base)};
      p = {0.70, 0.30};
      break;
    case WordClass::kVerb:
      l.forms = {base, third_person(base), past(base), gerund(base)};
      p = {0.40, 0.15, 0.25, 0.20};
      break;
    case WordClass::kAdjective:
      l.forms = {base, adverb(base), comparative(base), superlative(base)};
      p = {0.75, 0.15, 0.06, 0.04};
      break;
  }
  double sum = 0;
  for (double x : p) l.form_cdf.push_back(sum += x);
  l.form_cdf.back() = 1.0;
  return l;
}

}  // namespace

Vocabulary::Vocabulary(const VocabularyOptions& options) {
  Rng rng(options.seed);
  std::unordered_set<std::string> taken;  // membership only: order comes from rng
  for (std::string_view w : kCommon) {
    lemmas_.push_back(make_lemma(WordClass::kCommon, std::string(w)));
    taken.insert(std::string(w));
  }
  surface_count_ = kCommon.size();
  while (surface_count_ < options.surface_words) {
    std::string base = invent_lemma(rng, options.accented_share);
    if (base.size() < 3 || taken.count(base)) continue;
    const double r = rng.uniform();
    const WordClass cls = r < 0.45 ? WordClass::kNoun : r < 0.80 ? WordClass::kVerb : WordClass::kAdjective;
    Lemma l = make_lemma(cls, base);
    for (auto& f : l.forms)
      if (taken.insert(f).second) ++surface_count_;
    lemmas_.push_back(std::move(l));
  }
  // Law of abbreviation: frequent words are short. Rank invented lemmas by
  // length plus noise, so the head is mostly short words and the tail long
  // ones, and running text averages ~4.6 letters (5.8 bytes) a word, close to
  // the ~4.7 letters usually quoted for English prose (recalled from memory).
  std::vector<std::pair<double, std::size_t>> key;
  for (std::size_t i = kCommon.size(); i < lemmas_.size(); ++i)
    key.emplace_back(static_cast<double>(lemmas_[i].forms[0].size()) + 9.0 * rng.uniform(), i);
  std::stable_sort(key.begin(), key.end());
  std::vector<Lemma> ranked(lemmas_.begin(), lemmas_.begin() + kCommon.size());
  for (auto& [k, i] : key) ranked.push_back(std::move(lemmas_[i]));
  lemmas_ = std::move(ranked);

  double sum = 0;
  cdf_.reserve(lemmas_.size());
  for (std::size_t r = 0; r < lemmas_.size(); ++r)
    cdf_.push_back(sum += 1.0 / std::pow(static_cast<double>(r + 1) + options.zipf_q, options.zipf_s));
  for (double& c : cdf_) c /= sum;
  cdf_.back() = 1.0;
}

double Vocabulary::probability(std::size_t rank) const {
  return rank == 0 ? cdf_[0] : cdf_[rank] - cdf_[rank - 1];
}

std::size_t Vocabulary::sample_rank(Rng& rng) const {
  const double u = rng.uniform();
  auto it = std::upper_bound(cdf_.begin(), cdf_.end(), u);
  return std::min(static_cast<std::size_t>(it - cdf_.begin()), cdf_.size() - 1);
}

std::string_view Vocabulary::sample_form(std::size_t rank, Rng& rng) const {
  const Lemma& l = lemmas_[rank];
  if (l.forms.size() == 1) return l.forms[0];
  const double u = rng.uniform();
  std::size_t i = 0;
  while (i + 1 < l.forms.size() && u >= l.form_cdf[i]) ++i;
  return l.forms[i];
}

std::string Vocabulary::invent_word(Rng& rng, double accented_share) {
  return invent_lemma(rng, accented_share);
}

}  // namespace lode::bench
