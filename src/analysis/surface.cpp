#include "lode/surface.h"

namespace lode {

SurfaceForms::SurfaceForms(const std::vector<std::string>& terms) {
  for (auto& t : terms) counts_[t];
}

void SurfaceForms::add(std::string_view text, Analyzer& analyzer) {
  auto words = analyzer.words(text);
  auto tokens = analyzer.analyze(text).tokens;
  std::size_t w = 0;
  for (auto& t : tokens) {
    auto it = counts_.find(t.term);
    if (it == counts_.end()) continue;
    while (w < words.size() && words[w].begin < t.begin) ++w;
    // Both come from one segmentation, so a token starts where a word starts;
    // the term itself stands in if that ever fails.
    const bool same = w < words.size() && words[w].begin == t.begin;
    ++it->second[same ? words[w].term : t.term];
  }
}

std::string SurfaceForms::word(const std::string& term) const {
  auto it = counts_.find(term);
  if (it == counts_.end()) return term;
  const std::string* best = nullptr;
  std::uint32_t best_n = 0;
  for (auto& [form, n] : it->second)
    if (!best || n > best_n || (n == best_n && form.size() < best->size())) best = &form, best_n = n;
  return best ? *best : term;
}

std::uint32_t SurfaceForms::occurrences(const std::string& term) const {
  auto it = counts_.find(term);
  std::uint32_t total = 0;
  if (it != counts_.end())
    for (auto& [form, n] : it->second) total += n;
  return total;
}

std::map<std::string, std::string> SurfaceForms::words() const {
  std::map<std::string, std::string> out;
  for (auto& [term, forms] : counts_) out.emplace(term, word(term));
  return out;
}

}  // namespace lode
