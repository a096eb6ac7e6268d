// The byte escape and the terminal form of names (include/lode/names.h).
#include "lode/names.h"

#include "analysis/utf8_sequence.h"

namespace lode {
namespace {

constexpr char32_t kEscapeBase = 0xF700;  // byte b -> U+F700 + b, for b in 0x80..0xFF

// The code point of the well-formed sequence of `len` bytes at s[i].
char32_t code_point(std::string_view s, std::size_t i, std::size_t len) {
  const auto b = [&](std::size_t k) { return static_cast<char32_t>(static_cast<unsigned char>(s[i + k])); };
  switch (len) {
    case 1: return b(0);
    case 2: return (b(0) & 0x1F) << 6 | (b(1) & 0x3F);
    case 3: return (b(0) & 0x0F) << 12 | (b(1) & 0x3F) << 6 | (b(2) & 0x3F);
    default: return (b(0) & 0x07) << 18 | (b(1) & 0x3F) << 12 | (b(2) & 0x3F) << 6 | (b(3) & 0x3F);
  }
}

bool is_escape(char32_t c) { return c >= kEscapeBase + 0x80 && c <= kEscapeBase + 0xFF; }

void put_escaped_byte(std::string& out, unsigned char byte) {
  const char32_t c = kEscapeBase + byte;  // three UTF-8 bytes: EF 9E/9F xx
  out += static_cast<char>(0xE0 | (c >> 12));
  out += static_cast<char>(0x80 | ((c >> 6) & 0x3F));
  out += static_cast<char>(0x80 | (c & 0x3F));
}

// Calls keep(i, len) for each well-formed sequence that stays as it is and
// escape(i, len) for each run of bytes to be escaped, in order.
template <typename Keep, typename Escape>
void walk(std::string_view s, Keep&& keep, Escape&& escape) {
  for (std::size_t i = 0; i < s.size();) {
    std::size_t bad = 0;
    const std::size_t len = utf8_sequence_length(s, i, &bad);
    if (len == 0) {
      escape(i, bad);
      i += bad;
    } else if (len == 3 && is_escape(code_point(s, i, len))) {
      escape(i, len);
      i += len;
    } else {
      keep(i, len);
      i += len;
    }
  }
}

}  // namespace

std::string escape_name(std::string_view bytes) {
  std::string out;
  out.reserve(bytes.size());
  walk(
      bytes, [&](std::size_t i, std::size_t len) { out.append(bytes.substr(i, len)); },
      [&](std::size_t i, std::size_t len) {
        for (std::size_t k = 0; k < len; ++k) put_escaped_byte(out, static_cast<unsigned char>(bytes[i + k]));
      });
  return out;
}

bool name_needs_escape(std::string_view bytes) {
  bool needs = false;
  walk(bytes, [](std::size_t, std::size_t) {}, [&](std::size_t, std::size_t) { needs = true; });
  return needs;
}

bool holds_escaped_byte(std::string_view text) {
  for (std::size_t i = 0; i + 2 < text.size(); ++i) {
    std::size_t bad = 0;
    if (utf8_sequence_length(text, i, &bad) == 3 && is_escape(code_point(text, i, 3))) return true;
  }
  return false;
}

std::string unescape_name(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  for (std::size_t i = 0; i < text.size();) {
    std::size_t bad = 0;
    const std::size_t len = utf8_sequence_length(text, i, &bad);
    if (len == 3 && is_escape(code_point(text, i, 3))) {
      out += static_cast<char>(code_point(text, i, 3) - kEscapeBase);
      i += 3;
      continue;
    }
    const std::size_t n = len == 0 ? bad : len;
    out.append(text.substr(i, n));
    i += n;
  }
  return out;
}

std::string terminal_name(std::string_view bytes) {
  static constexpr char kHex[] = "0123456789abcdef";
  std::string out;
  out.reserve(bytes.size());
  const auto hex = [&](std::size_t i, std::size_t len) {
    for (std::size_t k = 0; k < len; ++k) {
      const auto b = static_cast<unsigned char>(bytes[i + k]);
      out += "\\x";
      out += kHex[b >> 4];
      out += kHex[b & 0xF];
    }
  };
  walk(
      bytes,
      [&](std::size_t i, std::size_t len) {
        const char32_t c = code_point(bytes, i, len);
        if (c < 0x20 || c == 0x7F || (c >= 0x80 && c <= 0x9F) || c == '\\') hex(i, len);
        else out.append(bytes.substr(i, len));
      },
      hex);
  return out;
}

}  // namespace lode
