// stemmer.h — libstemmer (Snowball) wrapper (private to src/analysis).
//
// Thread safety: a Stemmer is used by one thread at a time (libstemmer keeps
// per-instance state); the free functions are safe from any thread.
#pragma once

#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "lode/status.h"

struct sb_stemmer;

namespace lode::analysis {

// Snowball algorithm names that libstemmer can run on UTF-8, sorted. Aliases
// such as "en" are not listed: the index records the canonical name.
std::vector<std::string> snowball_algorithms();

class Stemmer {
 public:
  // `language` must be one of snowball_algorithms() or "none"; otherwise
  // InvalidArgument naming it and the known names.
  static Result<Stemmer> open(std::string_view language);

  // The stem of `word` ("none": the word itself). The view stays valid until
  // the next call. Words libstemmer cannot take (out of memory) come back whole.
  std::string_view stem(std::string_view word);

 private:
  struct Close {
    void operator()(sb_stemmer* s) const;
  };
  std::unique_ptr<sb_stemmer, Close> stemmer_;  // null for "none"
};

}  // namespace lode::analysis
