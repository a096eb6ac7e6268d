// UTF-8 validation and repair (include/lode/analysis.h).
//
// Well-formedness follows Unicode 15, Table 3-7: no overlong forms, no
// surrogates (U+D800..U+DFFF), nothing above U+10FFFF, no truncated sequences.
// Repair replaces each *maximal subpart* of an ill-formed sequence with one
// U+FFFD (Unicode 15, section 3.9 "U+FFFD Substitution of Maximal Subparts",
// the practice the WHATWG Encoding Standard also requires): a lead byte plus
// the continuation bytes that could still have started a valid sequence count
// as one error; a stray byte that can never start a sequence counts as one.
#include <cstdint>
#include <cstring>

#include "analysis/utf8_sequence.h"
#include "lode/analysis.h"

namespace lode {

std::size_t utf8_sequence_length(std::string_view s, std::size_t i, std::size_t* bad) {
  const auto b0 = static_cast<unsigned char>(s[i]);
  std::size_t need;           // continuation bytes after the lead
  unsigned char lo = 0x80;    // allowed range of the second byte
  unsigned char hi = 0xBF;
  if (b0 < 0x80) return 1;
  if (b0 >= 0xC2 && b0 <= 0xDF) {
    need = 1;
  } else if (b0 >= 0xE0 && b0 <= 0xEF) {
    need = 2;
    if (b0 == 0xE0) lo = 0xA0;  // overlong below U+0800
    if (b0 == 0xED) hi = 0x9F;  // surrogates
  } else if (b0 >= 0xF0 && b0 <= 0xF4) {
    need = 3;
    if (b0 == 0xF0) lo = 0x90;  // overlong below U+10000
    if (b0 == 0xF4) hi = 0x8F;  // above U+10FFFF
  } else {
    *bad = 1;  // 80..C1 and F5..FF never start a sequence
    return 0;
  }
  for (std::size_t k = 1; k <= need; ++k) {
    if (i + k >= s.size()) {  // truncated by the end of input
      *bad = k;
      return 0;
    }
    const auto b = static_cast<unsigned char>(s[i + k]);
    const bool ok = (k == 1) ? (b >= lo && b <= hi) : (b >= 0x80 && b <= 0xBF);
    if (!ok) {
      *bad = k;
      return 0;
    }
  }
  return need + 1;
}

namespace {

constexpr char kReplacement[] = "\xEF\xBF\xBD";  // U+FFFD

// Index of the first non-ASCII byte at or after `i` (s.size() if none).
// Eight bytes at a time: plain ASCII is the common case and must be fast.
std::size_t skip_ascii(std::string_view s, std::size_t i) {
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

}  // namespace

bool is_valid_utf8(std::string_view bytes) {
  std::size_t i = 0;
  const std::size_t n = bytes.size();
  while ((i = skip_ascii(bytes, i)) < n) {
    std::size_t bad = 0;
    const std::size_t len = utf8_sequence_length(bytes, i, &bad);
    if (len == 0) return false;
    i += len;
  }
  return true;
}

Utf8Repair repair_utf8(std::string_view bytes) {
  Utf8Repair out;
  const std::size_t n = bytes.size();
  std::size_t copied = 0;  // bytes[0, copied) are already in out.text
  std::size_t i = 0;
  while ((i = skip_ascii(bytes, i)) < n) {
    std::size_t bad = 0;
    const std::size_t len = utf8_sequence_length(bytes, i, &bad);
    if (len != 0) {
      i += len;
      continue;
    }
    if (out.replaced == 0) {
      out.first_bad_offset = i;
      out.text.reserve(n + 16);
    }
    out.text.append(bytes.data() + copied, i - copied);
    out.text.append(kReplacement, 3);
    ++out.replaced;
    i += bad;
    copied = i;
  }
  if (out.replaced == 0) {
    out.text.assign(bytes);
  } else {
    out.text.append(bytes.data() + copied, n - copied);
  }
  return out;
}

}  // namespace lode
