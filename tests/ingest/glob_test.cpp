// glob_match: the fnmatch subset is checked against the C library's own
// fnmatch(3) with FNM_PATHNAME (glibc's implementation of the POSIX rules);
// "**" has no POSIX counterpart and is checked against the rule stated in
// include/lode/ingest.h. Known, deliberate differences, left out here: POSIX
// bracket extras ([:alpha:], [.x.], [=x=]) are not supported, and glibc never
// matches a "*" followed by an escaped "\/", which we read as "*" then "/".
#include <fnmatch.h>

#include <doctest/doctest.h>

#include <string>
#include <utility>
#include <vector>

#include "lode/ingest.h"

using lode::glob_match;

TEST_CASE("glob_match agrees with glibc fnmatch(FNM_PATHNAME) without **") {
  const std::vector<std::string> patterns = {
      "*.txt", "a/*.txt", "*", "?", "a?c", "a/?", "[abc].md", "[!abc].md", "[^abc].md",
      "[a-c]x", "[]]", "[!]]", "a\\*b", "*/*", "a/*/c", "*c", "a*b*c", "[", "a[b",
      "*.[mM][dD]", "docs/**.md", "a/b", "", "a*", ".*", "a\\/b", "a\\", "\\", "[^/]",
      "[a/]", "*[!/]c"};
  const std::vector<std::string> paths = {
      "x.txt", "a/x.txt", "a/b/x.txt", "a", "abc", "a/b", "a/b/c", "b.md", "d.md", "bx",
      "dx", "]", "a*b", "axb", "a/x/c", "abcabc", "[", "a[b", "NOTE.Md", "docs/x.md",
      "docs/a/x.md", "", ".hidden", "ab/c"};
  for (const auto& p : patterns) {
    for (const auto& s : paths) {
      CAPTURE(p);
      CAPTURE(s);
      const bool libc = ::fnmatch(p.c_str(), s.c_str(), FNM_PATHNAME) == 0;
      CHECK(glob_match(p, s) == libc);
    }
  }
}

TEST_CASE("** matches any number of folders including none") {
  struct Case {
    const char* pattern;
    const char* path;
    bool match;
  };
  const Case cases[] = {
      {"**", "x", true},
      {"**", "a/b/c/x", true},
      {"**/x.txt", "x.txt", true},
      {"**/x.txt", "a/b/x.txt", true},
      {"**/x.txt", "a/b/y.txt", false},
      {"**/*.md", "notes/2024/jan.md", true},
      {"**/*.md", "jan.md", true},
      {"**/*.md", "notes/jan.mdx", false},
      {"a/**/b", "a/b", true},
      {"a/**/b", "a/x/y/b", true},
      {"a/**/b", "a/x/y/bc", false},
      {"a/**", "a/x", true},
      {"a/**", "a/x/y", true},
      {"a/**", "b/x", false},
      {"build/**", "src/build/x", false},
      {"**/build/**", "src/build/x", true},
      {"**/a/**/b/**/c", "a/b/c", true},
      {"**/a/**/b/**/c", "x/a/y/b/z/c", true},
      {"**/a/**/b/**/c", "x/a/y/c/z/b", false},
      // "**" inside a segment is an ordinary "*": it does not cross '/'.
      {"a**", "abc", true},
      {"a**", "ab/c", false},
  };
  for (const Case& c : cases) {
    CAPTURE(c.pattern);
    CAPTURE(c.path);
    CHECK(glob_match(c.pattern, c.path) == c.match);
  }
}

TEST_CASE("? and classes take whole UTF-8 characters") {
  CHECK(glob_match("caf?.txt", "caf\xC3\xA9.txt"));        // é is two bytes, one character
  CHECK_FALSE(glob_match("caf??.txt", "caf\xC3\xA9.txt"));
  CHECK(glob_match("[\xC3\xA9" "e].md", "\xC3\xA9.md"));
  CHECK(glob_match("[a-\xC3\xBF]", "\xC3\xA9"));            // range up to U+00FF
  CHECK_FALSE(glob_match("[a-z]", "\xC3\xA9"));
}

TEST_CASE("many stars and ** segments stay cheap") {
  // Backtracking matchers take exponential time here; a hang would show it.
  const std::string path = std::string(60, 'a') + "/" + std::string(60, 'a');
  CHECK_FALSE(glob_match("*a*a*a*a*a*a*a*a*a*a*a*a*b/**", path));
  std::string deep;
  for (int i = 0; i < 200; ++i) deep += "d/";
  deep += "x";
  CHECK(glob_match("**/**/**/**/**/**/x", deep));
  CHECK_FALSE(glob_match("**/**/**/**/**/**/y", deep));
}
