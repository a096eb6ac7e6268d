// lode/surface.h — index terms back to the words people wrote.
//
// The index stores analyzed terms: folded and stemmed ("damag", "jetti").
// Where lode shows terms to a reader rather than for analysis (the page's
// term legend, theme terms, key terms), it shows each term's most frequent
// word in the documents at hand instead: their stored text is analyzed again
// with the index's analyzer and every word that gives a wanted term is
// counted in its folded form ("damage", "jetties"). Nothing is stored; the
// cost is one analysis of the text given.
//
// Thread safety: a SurfaceForms is used by one thread at a time; it uses the
// given (single-threaded) Analyzer.
#pragma once

#include <cstdint>
#include <map>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "lode/analysis.h"

namespace lode {

class SurfaceForms {
 public:
  // Counts words for these terms only (analyzed terms, as the index has them).
  explicit SurfaceForms(const std::vector<std::string>& terms);
  // Counts the words of `text` whose analyzed term is wanted.
  void add(std::string_view text, Analyzer& analyzer);
  // The most frequent folded word seen for `term` (ties: the shorter, then
  // the first in byte order); `term` itself when none was seen.
  std::string word(const std::string& term) const;
  // How many words of the text added gave `term`.
  std::uint32_t occurrences(const std::string& term) const;
  // word() of every wanted term.
  std::map<std::string, std::string> words() const;

 private:
  std::unordered_map<std::string, std::map<std::string, std::uint32_t>> counts_;
};

}  // namespace lode
