// HTML character references for the Markdown reader. Numeric references are
// decoded in full; of the named ones (HTML defines over 2,000) only the common
// ones that appear in hand-written Markdown are known, the rest stay as text.
#include <array>
#include <utility>

#include "ingest/markdown_inline.h"
#include "ingest/text_util.h"

namespace lode::ingest {
namespace {

constexpr std::size_t kMaxNameBytes = 32;

// Code points from the HTML named character reference table (WHATWG HTML,
// "Named character references").
constexpr std::array<std::pair<std::string_view, char32_t>, 33> kNamed{{
    {"amp", U'&'},      {"lt", U'<'},       {"gt", U'>'},       {"quot", U'"'},
    {"apos", U'\''},    {"nbsp", U' '},  // kept as a plain space: it separates words
    {"copy", U'\u00A9'}, {"reg", U'\u00AE'}, {"trade", U'\u2122'}, {"mdash", U'\u2014'},
    {"ndash", U'\u2013'}, {"hellip", U'\u2026'}, {"laquo", U'\u00AB'}, {"raquo", U'\u00BB'},
    {"lsquo", U'\u2018'}, {"rsquo", U'\u2019'}, {"ldquo", U'\u201C'}, {"rdquo", U'\u201D'},
    {"euro", U'\u20AC'}, {"pound", U'\u00A3'}, {"yen", U'\u00A5'}, {"cent", U'\u00A2'},
    {"deg", U'\u00B0'},  {"times", U'\u00D7'}, {"divide", U'\u00F7'}, {"middot", U'\u00B7'},
    {"bull", U'\u2022'}, {"sect", U'\u00A7'}, {"para", U'\u00B6'}, {"plusmn", U'\u00B1'},
    {"larr", U'\u2190'}, {"rarr", U'\u2192'}, {"shy", U'\u00AD'},
}};

bool is_digit(char c) { return c >= '0' && c <= '9'; }
bool is_hex(char c) { return is_digit(c) || (c >= 'a' && c <= 'f') || (c >= 'A' && c <= 'F'); }
bool is_alnum(char c) { return is_digit(c) || (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z'); }

unsigned hex_value(char c) {
  if (is_digit(c)) return static_cast<unsigned>(c - '0');
  return static_cast<unsigned>((c | 0x20) - 'a' + 10);
}

Entity numeric(std::string_view s) {
  // s = "&#..." ; decimal up to 7 digits, hex up to 6 (CommonMark's limits).
  const bool hex = s.size() > 2 && (s[2] == 'x' || s[2] == 'X');
  std::size_t i = hex ? 3 : 2;
  const std::size_t max_digits = hex ? 6 : 7;
  char32_t cp = 0;
  std::size_t digits = 0;
  while (i < s.size() && digits < max_digits && (hex ? is_hex(s[i]) : is_digit(s[i]))) {
    cp = cp * (hex ? 16u : 10u) + (hex ? hex_value(s[i]) : static_cast<unsigned>(s[i] - '0'));
    ++i;
    ++digits;
  }
  if (digits == 0 || i >= s.size() || s[i] != ';') return {};
  if (cp == 0) cp = 0xFFFD;  // NUL is never text
  return Entity{i + 1, utf8_encode(cp)};
}

}  // namespace

Entity match_entity(std::string_view s) {
  if (s.size() < 3 || s[0] != '&') return {};
  if (s[1] == '#') return numeric(s);
  std::size_t i = 1;
  while (i < s.size() && i <= kMaxNameBytes && is_alnum(s[i])) ++i;
  if (i == 1 || i >= s.size() || s[i] != ';') return {};
  const std::string_view name = s.substr(1, i - 1);
  for (const auto& [known, cp] : kNamed) {
    if (known == name) return Entity{i + 1, cp == U'\u00AD' ? std::string() : utf8_encode(cp)};
  }
  return {};
}

}  // namespace lode::ingest
