// Glob matching for the crawl's include/exclude rules: fnmatch with
// FNM_PATHNAME semantics ("*", "?" and classes never match '/') plus "**" as a
// whole path segment, matching any number of folders (zero included).
//
// Matching runs segment by segment. "**" is resolved with a one-row dynamic
// programme over (pattern segment, path segment), so patterns such as
// "**/a/**/b/**" cost O(segments^2) segment matches, never exponential
// backtracking. Within a segment, "*" uses the usual single-backtrack-point
// scan. "?" and classes consume one UTF-8 character, not one byte.
// Not supported: POSIX bracket extras ([[:alpha:]], [.x.], [=x=]).
#include <algorithm>
#include <string_view>
#include <vector>

#include "lode/ingest.h"

namespace lode {
namespace {

constexpr std::size_t npos = std::string_view::npos;

// Decodes the character at s[i] and advances i past it. A byte that does not
// start a well-formed sequence counts as one character (its byte value), so
// non-UTF-8 file names still match "?" one byte at a time.
char32_t next_char(std::string_view s, std::size_t& i) {
  const auto c = static_cast<unsigned char>(s[i]);
  std::size_t n = c < 0xC0 ? 1 : c < 0xE0 ? 2 : c < 0xF0 ? 3 : c < 0xF8 ? 4 : 1;
  if (n == 1 || i + n > s.size()) {
    ++i;
    return c;
  }
  char32_t cp = c & (0x7Fu >> n);
  for (std::size_t k = 1; k < n; ++k) {
    const auto d = static_cast<unsigned char>(s[i + k]);
    if ((d & 0xC0) != 0x80) {
      ++i;
      return c;
    }
    cp = (cp << 6) | (d & 0x3Fu);
  }
  i += n;
  return cp;
}

// Matches a bracket class starting at p[pi] == '[' against character `ch`.
// Returns the index just past the closing ']' and sets `matched`; returns npos
// when the class is unterminated (the '[' is then an ordinary character).
std::size_t match_class(std::string_view p, std::size_t pi, char32_t ch, bool& matched) {
  std::size_t i = pi + 1;
  bool negate = false;
  if (i < p.size() && (p[i] == '!' || p[i] == '^')) {
    negate = true;
    ++i;
  }
  bool hit = false;
  bool first = true;
  while (i < p.size()) {
    if (p[i] == ']' && !first) {
      matched = hit != negate;
      return i + 1;
    }
    first = false;
    if (p[i] == '\\' && i + 1 < p.size()) ++i;
    const char32_t lo = next_char(p, i);
    char32_t hi = lo;
    if (i + 1 < p.size() && p[i] == '-' && p[i + 1] != ']') {
      ++i;
      if (p[i] == '\\' && i + 1 < p.size()) ++i;
      hi = next_char(p, i);
    }
    if (lo <= ch && ch <= hi) hit = true;
  }
  return npos;
}

// Matches one non-'*' pattern element at p[pi] against s[si]; on success
// advances both indices.
bool match_one(std::string_view p, std::size_t& pi, std::string_view s, std::size_t& si) {
  if (p[pi] == '?') {
    ++pi;
    next_char(s, si);
    return true;
  }
  if (p[pi] == '[') {
    std::size_t probe = si;
    const char32_t ch = next_char(s, probe);
    bool matched = false;
    const std::size_t end = match_class(p, pi, ch, matched);
    if (end != npos) {
      if (!matched) return false;
      pi = end;
      si = probe;
      return true;
    }
    // Unterminated class: '[' is literal; fall through.
  }
  if (p[pi] == '\\' && pi + 1 < p.size()) ++pi;
  if (p[pi] != s[si]) return false;
  ++pi;
  ++si;
  return true;
}

bool match_segment(std::string_view p, std::string_view s) {
  std::size_t pi = 0, si = 0;
  std::size_t star_p = npos, star_s = 0;
  while (si < s.size()) {
    if (pi < p.size() && p[pi] == '*') {
      while (pi < p.size() && p[pi] == '*') ++pi;
      star_p = pi;
      star_s = si;
      continue;
    }
    if (pi < p.size()) {
      std::size_t p2 = pi, s2 = si;
      if (match_one(p, p2, s, s2)) {
        pi = p2;
        si = s2;
        continue;
      }
    }
    if (star_p == npos) return false;
    // Let the last '*' absorb one more character and retry from there.
    next_char(s, star_s);
    pi = star_p;
    si = star_s;
  }
  while (pi < p.size() && p[pi] == '*') ++pi;
  return pi == p.size();
}

// Index just past the bracket class opening at p[pi], or npos when it is
// unterminated; the same reading as match_class (a leading ']' is a member,
// a backslash escapes the next character).
std::size_t class_end(std::string_view p, std::size_t pi) {
  std::size_t i = pi + 1;
  if (i < p.size() && (p[i] == '!' || p[i] == '^')) ++i;
  if (i < p.size() && p[i] == ']') ++i;
  while (i < p.size() && p[i] != ']') i += (p[i] == '\\' && i + 1 < p.size()) ? 2 : 1;
  return i < p.size() ? i + 1 : npos;
}

// Splits a path on '/'. For a pattern (`pattern` true), a '/' inside a
// bracket class does not split (the class simply never matches '/'), and an
// escaped "\/" is a separator, both as glibc's fnmatch reads them.
std::vector<std::string_view> split_slash(std::string_view s, bool pattern) {
  std::vector<std::string_view> parts;
  std::size_t start = 0;
  for (std::size_t i = 0; i < s.size();) {
    if (pattern && s[i] == '[') {
      const std::size_t end = class_end(s, i);
      i = end == npos ? i + 1 : end;
    } else if (pattern && s[i] == '\\' && i + 1 < s.size() && s[i + 1] != '/') {
      i += 2;
    } else if (s[i] == '/' || (pattern && s[i] == '\\' && i + 1 < s.size())) {
      parts.push_back(s.substr(start, i - start));
      i += s[i] == '/' ? 1 : 2;
      start = i;
    } else {
      ++i;
    }
  }
  parts.push_back(s.substr(start));
  return parts;
}

}  // namespace

bool glob_match(std::string_view pattern, std::string_view relative_path) {
  // A trailing unescaped backslash makes the pattern malformed: like
  // fnmatch, it then matches nothing.
  std::size_t backslashes = 0;
  while (backslashes < pattern.size() && pattern[pattern.size() - 1 - backslashes] == '\\') ++backslashes;
  if (backslashes % 2 == 1) return false;
  const auto pat = split_slash(pattern, true);
  const auto path = split_slash(relative_path, false);
  const std::size_t n = path.size();
  // reach[j]: the pattern segments seen so far match the first j path segments.
  std::vector<char> reach(n + 1, 0), next(n + 1, 0);
  reach[0] = 1;
  for (const std::string_view seg : pat) {
    std::fill(next.begin(), next.end(), 0);
    if (seg == "**") {
      for (std::size_t j = 0; j <= n; ++j) next[j] = reach[j] || (j > 0 && next[j - 1]);
    } else {
      for (std::size_t j = 0; j < n; ++j) {
        if (reach[j] && match_segment(seg, path[j])) next[j + 1] = 1;
      }
    }
    reach.swap(next);
  }
  return reach[n] != 0;
}

}  // namespace lode
