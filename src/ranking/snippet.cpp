#include "ranking/snippet.h"

#include <map>

namespace lode::rank {
namespace {

// Largest index <= i that starts a UTF-8 code point.
std::size_t utf8_floor(std::string_view s, std::size_t i) {
  while (i > 0 && i < s.size() && (static_cast<unsigned char>(s[i]) & 0xC0) == 0x80) --i;
  return i;
}

}  // namespace

Snippet make_snippet(std::string_view body, Analyzer& analyzer,
                     const std::unordered_set<std::string>& terms) {
  Snippet out;
  std::string_view scan = body.substr(0, utf8_floor(body, std::min(body.size(), kSnippetScanBytes)));
  auto words = analyzer.analyze(scan).tokens;
  if (words.empty()) return out;
  // Sliding window over tokens: count distinct matched terms, then matches.
  std::size_t best_start = 0, best_distinct = 0, best_hits = 0;
  std::map<std::string_view, int> in_window;
  std::size_t hits = 0;
  auto matched = [&](std::size_t i) { return terms.count(words[i].term) > 0; };
  for (std::size_t end = 0; end < words.size(); ++end) {
    if (matched(end)) {
      ++in_window[words[end].term];
      ++hits;
    }
    if (end >= kSnippetWords) {
      std::size_t gone = end - kSnippetWords;
      if (matched(gone)) {
        if (--in_window[words[gone].term] == 0) in_window.erase(words[gone].term);
        --hits;
      }
    }
    if (in_window.size() > best_distinct || (in_window.size() == best_distinct && hits > best_hits)) {
      best_distinct = in_window.size();
      best_hits = hits;
      best_start = end >= kSnippetWords ? end - kSnippetWords + 1 : 0;
    }
  }
  // Start a few words before the first match so it reads in context.
  std::size_t first = best_start;
  while (first < words.size() && first < best_start + kSnippetWords && !matched(first)) ++first;
  if (first < words.size() && first < best_start + kSnippetWords)
    best_start = first >= 3 ? std::max(best_start, first - 3) : best_start;
  std::size_t last = std::min(words.size(), best_start + kSnippetWords) - 1;
  std::size_t from = best_start == 0 ? 0 : words[best_start].begin;
  std::size_t to = last + 1 == words.size() && scan.size() == body.size() ? body.size() : words[last].end;
  if (from > 0) out.text = "… ";
  std::size_t base = out.text.size();
  for (char c : body.substr(from, to - from)) out.text.push_back(c == '\n' || c == '\t' || c == '\r' ? ' ' : c);
  for (std::size_t i = best_start; i <= last; ++i)
    if (matched(i))
      out.marks.emplace_back(static_cast<std::uint32_t>(base + words[i].begin - from),
                             static_cast<std::uint32_t>(base + words[i].end - from));
  if (to < body.size()) out.text += " …";
  return out;
}

}  // namespace lode::rank
