// stopwords.h — the compiled-in Snowball stopword lists (private to src/analysis).
//
// The lists live in src/analysis/stopwords/<list>.txt; scripts/gen_stopwords.py
// compiles them into stopwords_data.cpp. Sources and licence: docs/stopwords.md.
//
// Thread safety: immutable data and pure functions.
#pragma once

#include <cstddef>
#include <string_view>

namespace lode::analysis {

struct StopwordFile {
  std::string_view name;   // list name: "english", "french", ...
  std::string_view words;  // one word per line, as published (not yet folded)
};

extern const StopwordFile kStopwordFiles[];
extern const std::size_t kStopwordFileCount;

// The list used by Snowball algorithm `language` ("porter" -> "english",
// "german2" -> "german", "kraaij_pohlmann" -> "dutch", ...), or nullptr when
// the language has none ("none", "arabic", ...).
const StopwordFile* stopword_file_for(std::string_view language);

}  // namespace lode::analysis
