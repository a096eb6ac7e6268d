// Invented words and English inflection rules (see morphology.h).
#include "morphology.h"

#include <array>
#include <string_view>

namespace lode::bench {
namespace {

// Syllable parts, weighted by repetition: plain consonants are more common
// than clusters, as in English spelling.
constexpr std::array<std::string_view, 52> kOnsets = {
    "",   "",   "",   "b",  "b",  "c",  "c",  "d",  "d",  "f",  "g",  "h",  "h",
    "j",  "k",  "l",  "l",  "m",  "m",  "n",  "n",  "p",  "p",  "r",  "r",  "s",
    "s",  "t",  "t",  "v",  "w",  "w",  "y",  "bl", "br", "ch", "cl", "cr", "dr",
    "fl", "fr", "gl", "gr", "pl", "pr", "sh", "sl", "sp", "st", "th", "tr", "str"};
constexpr std::array<std::string_view, 20> kVowels = {
    "a", "a", "a", "e", "e", "e", "i", "i", "o", "o", "u", "u", "ai", "ea", "ee", "oo", "ou", "oa", "ie", "ay"};
constexpr std::array<std::string_view, 40> kCodas = {
    "",   "",   "",   "",   "",   "",   "b",  "ck", "d",  "d",  "g",  "l",  "ll", "m",
    "n",  "n",  "n",  "p",  "r",  "r",  "s",  "s",  "t",  "t",  "x",  "ft", "ld", "lk",
    "mp", "nd", "ng", "nk", "nt", "rd", "rk", "rn", "rt", "sh", "st", "th"};
constexpr std::array<std::string_view, 14> kEndings = {
    "tion", "ment", "ness", "ity", "al", "ous", "ive", "ful", "less", "able", "ize", "ence", "ship", "ist"};
// UTF-8 accented vowels (2 bytes each).
constexpr std::array<std::string_view, 8> kAccented = {"é", "è", "á", "ö", "ü", "ï", "ô", "ñ"};

bool is_vowel(char c) { return c == 'a' || c == 'e' || c == 'i' || c == 'o' || c == 'u'; }
bool ends_with(const std::string& s, std::string_view tail) {
  return s.size() >= tail.size() && s.compare(s.size() - tail.size(), tail.size(), tail) == 0;
}
bool consonant_y(const std::string& s) {
  return s.size() >= 2 && s.back() == 'y' && !is_vowel(s[s.size() - 2]);
}
// A short word ending consonant-vowel-consonant ("stop", "plan"): English
// doubles the final consonant before a vowel suffix.
bool doubles(const std::string& s) {
  if (s.size() < 3 || s.size() > 5) return false;
  const char c = s.back(), v = s[s.size() - 2], p = s[s.size() - 3];
  return !is_vowel(c) && c != 'w' && c != 'x' && c != 'y' && is_vowel(v) && !is_vowel(p);
}
bool silent_e(const std::string& s) { return s.size() >= 3 && s.back() == 'e' && !ends_with(s, "ee"); }

// A vowel-initial suffix (-ed, -ing, -er, -est) with the spelling changes.
std::string vowel_suffix(const std::string& w, std::string_view suffix) {
  if (consonant_y(w) && suffix != "ing") return w.substr(0, w.size() - 1) + "i" + std::string(suffix);
  if (silent_e(w)) return w.substr(0, w.size() - 1) + std::string(suffix);
  if (doubles(w)) return w + w.back() + std::string(suffix);
  return w + std::string(suffix);
}

}  // namespace

std::string invent_lemma(Rng& rng, double accented_share) {
  const double r = rng.uniform();
  const int syllables = r < 0.35 ? 1 : r < 0.80 ? 2 : r < 0.97 ? 3 : 4;
  std::string w;
  for (int i = 0; i < syllables; ++i) {
    std::string_view onset = kOnsets[rng.below(kOnsets.size())];
    if (i > 0 && onset.empty()) onset = kOnsets[3 + rng.below(kOnsets.size() - 3)];  // no vowel clash
    w += onset;
    w += kVowels[rng.below(kVowels.size())];
    if (i + 1 == syllables || rng.chance(0.2)) w += kCodas[rng.below(kCodas.size())];
  }
  if (syllables <= 2 && rng.chance(0.15)) {
    std::string_view ending = kEndings[rng.below(kEndings.size())];
    if (is_vowel(w.back()) && is_vowel(ending.front())) w.pop_back();
    w += ending;
  }
  if (rng.chance(accented_share)) {  // swap the first plain vowel for an accented one
    for (std::size_t i = 0; i < w.size(); ++i)
      if (is_vowel(w[i])) {
        w.replace(i, 1, kAccented[rng.below(kAccented.size())]);
        break;
      }
  }
  return w;
}

std::string plural(const std::string& w) {
  if (consonant_y(w)) return w.substr(0, w.size() - 1) + "ies";
  if (ends_with(w, "s") || ends_with(w, "x") || ends_with(w, "z") || ends_with(w, "ch") || ends_with(w, "sh"))
    return w + "es";
  return w + "s";
}

std::string third_person(const std::string& w) { return plural(w); }

std::string past(const std::string& w) {
  if (silent_e(w) || ends_with(w, "ee")) return w + "d";
  return vowel_suffix(w, "ed");
}

std::string gerund(const std::string& w) {
  if (ends_with(w, "ie")) return w.substr(0, w.size() - 2) + "ying";
  return vowel_suffix(w, "ing");
}

std::string comparative(const std::string& w) {
  if (silent_e(w) || ends_with(w, "ee")) return w + "r";
  return vowel_suffix(w, "er");
}

std::string superlative(const std::string& w) {
  if (silent_e(w) || ends_with(w, "ee")) return w + "st";
  return vowel_suffix(w, "est");
}

std::string adverb(const std::string& w) {
  if (consonant_y(w)) return w.substr(0, w.size() - 1) + "ily";
  if (ends_with(w, "le") && w.size() > 3) return w.substr(0, w.size() - 1) + "y";
  if (ends_with(w, "ic")) return w + "ally";
  return w + "ly";
}

}  // namespace lode::bench
