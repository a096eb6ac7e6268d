// Splitting text between the ASCII fast path and ICU (see segment.h).
#include <cstdint>
#include <cstring>

#include "analysis/segment.h"

namespace lode::analysis {
namespace {

// An ICU stretch ends at the first safe boundary followed by at least this
// many ASCII bytes, so short ASCII gaps between non-ASCII words (the spaces
// in Cyrillic or Greek text) do not cost one ICU call per word.
constexpr std::size_t kMinAsciiRun = 64;
// ...or, once longer than this, at any safe boundary: bounds ICU's offsets.
constexpr std::size_t kMaxIcuStretch = std::size_t{1} << 24;

std::size_t first_non_ascii(std::string_view s, std::size_t i) {
  const std::size_t n = s.size();
  while (i + 8 <= n) {
    std::uint64_t w;
    std::memcpy(&w, s.data() + i, 8);
    if (w & 0x8080808080808080ULL) break;
    i += 8;
  }
  while (i < n && static_cast<unsigned char>(s[i]) < 0x80) ++i;
  return i;
}

// End of the ICU stretch that holds the non-ASCII byte at `q`.
std::size_t icu_stretch_end(std::string_view s, std::size_t start, std::size_t q) {
  const std::size_t n = s.size();
  std::size_t cut = SIZE_MAX;  // first safe boundary after the last non-ASCII byte
  for (std::size_t i = q + 1; i < n; ++i) {
    if (static_cast<unsigned char>(s[i]) >= 0x80) {
      cut = SIZE_MAX;
      continue;
    }
    if (cut == SIZE_MAX) {
      if (is_safe_boundary(s, i)) cut = i;
    } else if (i - cut >= kMinAsciiRun || i - start >= kMaxIcuStretch) {
      return cut;
    }
  }
  return n;
}

}  // namespace

void segment(std::string_view text, IcuWords& icu, WordSink& sink, std::string& scratch) {
  const std::size_t n = text.size();
  std::size_t pos = 0;  // always a safe boundary (or 0)
  while (pos < n) {
    const std::size_t q = first_non_ascii(text, pos);
    if (q == n) {
      ascii_words(text, pos, n, sink, scratch);
      return;
    }
    // Back up to the last safe boundary before the non-ASCII byte: the word
    // that holds it ("café", "naïve") must go to ICU whole.
    std::size_t b = q;
    while (b > pos && !is_safe_boundary(text, b)) --b;
    ascii_words(text, pos, b, sink, scratch);
    const std::size_t e = icu_stretch_end(text, b, q);
    icu.run(text, b, e, sink);
    pos = e;
  }
}

}  // namespace lode::analysis
