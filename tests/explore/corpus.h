// Invented corpora for the explore tests, generated from a seed (no outside
// text): labelled topics with their own words, and planted near-duplicates.
#pragma once

#include <cstdint>
#include <random>
#include <string>
#include <vector>

namespace lode::test {

// Words "<prefix>" + letters: "ka", "kb", ... (2+ letters, so scikit-learn's
// token pattern keeps them) — a vocabulary of n distinct words.
inline std::vector<std::string> invented_words(const std::string& prefix, std::size_t n) {
  std::vector<std::string> out;
  for (std::size_t i = 0; i < n; ++i) {
    std::string w = prefix;
    for (std::size_t x = i;; x = x / 26 - 1) {
      w += static_cast<char>('a' + x % 26);
      if (x < 26) break;
    }
    out.push_back(w);
  }
  return out;
}

// A text of `len` words: each from `topic` with probability `p_topic`, else
// from `common`.
inline std::string invented_text(std::mt19937_64& rng, const std::vector<std::string>& topic,
                                 const std::vector<std::string>& common, std::size_t len, double p_topic) {
  std::string out;
  for (std::size_t i = 0; i < len; ++i) {
    bool use_topic = static_cast<double>(rng() % 1000) < p_topic * 1000;
    const auto& from = use_topic ? topic : common;
    if (!out.empty()) out += ' ';
    out += from[rng() % from.size()];
  }
  return out;
}

// A copy of `text` with about `share` of its words replaced from `words`.
inline std::string edited_copy(std::mt19937_64& rng, const std::string& text, const std::vector<std::string>& words,
                               double share) {
  std::string out, w;
  auto flush = [&] {
    if (w.empty()) return;
    if (!out.empty()) out += ' ';
    out += static_cast<double>(rng() % 1000) < share * 1000 ? words[rng() % words.size()] : w;
    w.clear();
  };
  for (char c : text) {
    if (c == ' ') flush();
    else w += c;
  }
  flush();
  return out;
}

}  // namespace lode::test
