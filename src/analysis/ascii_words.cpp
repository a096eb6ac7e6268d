// The ASCII fast path of word segmentation (see segment.h).
//
// UAX #29 restricted to ASCII, with ICU 72's root tailoring, classifies:
//   ALetter A-Z a-z   Numeric 0-9   ExtendNumLet _
//   MidNumLet .   Single_Quote '   MidNum , ;
//   (':' is MidLetter in UAX #29 but ICU's root rules remove it; '"' only
//   joins Hebrew letters; everything else is Other, CR, LF, Newline or space.)
// The rules that join ASCII characters into one word are then
//   WB5/8/9/10/13a/13b  any two of {letter, digit, _} stay together;
//   WB6/7    letter (. or ') letter stay together;
//   WB11/12  digit (. ' , ;) digit stay together;
// and a segment is word-like unless it is a lone "_" (ICU gives "__", "a_",
// "_1" a word status, a single "_" none). Checked against ICU itself by
// tests/analysis/segment_test.cpp.
#include <array>
#include <cstdint>

#include "analysis/segment.h"

namespace lode::analysis {
namespace {

enum Kind : std::uint8_t {
  kOther = 0,
  kLetter,
  kDigit,
  kUnderscore,
  kMidNumLet,  // . '   join letters and digits
  kMidNum,     // , ;   join digits
  kJoiner,     // : "   join nothing in ASCII, but are not safe boundaries
  kSpace,      // ' '   WSegSpace (WB3d keeps runs together)
  kCr,         // '\r'  (WB3 keeps CR LF together)
};

constexpr std::array<std::uint8_t, 128> make_kinds() {
  std::array<std::uint8_t, 128> k{};
  for (int c = 'a'; c <= 'z'; ++c) k[static_cast<std::size_t>(c)] = kLetter;
  for (int c = 'A'; c <= 'Z'; ++c) k[static_cast<std::size_t>(c)] = kLetter;
  for (int c = '0'; c <= '9'; ++c) k[static_cast<std::size_t>(c)] = kDigit;
  k['_'] = kUnderscore;
  k['.'] = kMidNumLet;
  k['\''] = kMidNumLet;
  k[','] = kMidNum;
  k[';'] = kMidNum;
  k[':'] = kJoiner;
  k['"'] = kJoiner;
  k[' '] = kSpace;
  k['\r'] = kCr;
  return k;
}
constexpr std::array<std::uint8_t, 128> kKinds = make_kinds();

inline std::uint8_t kind(char c) { return kKinds[static_cast<unsigned char>(c) & 0x7F]; }
inline bool is_word_kind(std::uint8_t k) { return k >= kLetter && k <= kUnderscore; }

}  // namespace

bool is_safe_boundary(std::string_view text, std::size_t b) {
  if (b == 0 || b >= text.size()) return b == 0 || b == text.size();
  const auto left = static_cast<unsigned char>(text[b - 1]);
  const auto right = static_cast<unsigned char>(text[b]);
  // A non-ASCII neighbour might be Extend/Format/ZWJ (WB4), a Hebrew letter,
  // a regional indicator...: not safe.
  if (left >= 0x80 || right >= 0x80) return false;
  const std::uint8_t lk = kKinds[left];
  if (lk == kSpace) return right != ' ';           // WB3d
  if (lk == kCr) return right != '\n';             // WB3
  return lk == kOther;
}

void ascii_words(std::string_view text, std::size_t from, std::size_t to, WordSink& sink,
                 std::string& scratch) {
  const char* s = text.data();
  std::size_t i = from;
  while (i < to) {
    while (i < to && !is_word_kind(kind(s[i]))) ++i;
    if (i >= to) break;
    const std::size_t start = i;
    std::uint8_t prev = kind(s[i++]);
    while (i < to) {
      const std::uint8_t k = kind(s[i]);
      if (is_word_kind(k)) {
        prev = k;
        ++i;
        continue;
      }
      if (i + 1 >= to || (k != kMidNumLet && k != kMidNum)) break;
      const std::uint8_t next = kind(s[i + 1]);
      const bool joins = (prev == kDigit && next == kDigit) ||
                         (k == kMidNumLet && prev == kLetter && next == kLetter);
      if (!joins) break;
      prev = next;
      i += 2;
    }
    if (i - start == 1 && s[start] == '_') continue;  // lone "_": not word-like
    scratch.assign(s + start, i - start);
    for (char& c : scratch) {
      if (c >= 'A' && c <= 'Z') c = static_cast<char>(c + ('a' - 'A'));
    }
    sink.word(scratch, start, i);
  }
}

}  // namespace lode::analysis
