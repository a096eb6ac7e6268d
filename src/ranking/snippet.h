// Snippets: the body window with the most distinct query terms.
#pragma once

#include <string_view>
#include <unordered_set>

#include "lode/analysis.h"
#include "lode/ranking.h"

namespace lode::rank {

// Only the first kSnippetScanBytes of a body are scanned for a window, so a
// huge document cannot make one hit slow; past that the snippet is its start.
inline constexpr std::size_t kSnippetScanBytes = 256 * 1024;
inline constexpr std::size_t kSnippetWords = 30;

// Picks a window of about kSnippetWords words from `body` covering the most
// distinct `terms` (analyzed forms), marking every matched word.
Snippet make_snippet(std::string_view body, Analyzer& analyzer,
                     const std::unordered_set<std::string>& terms);

}  // namespace lode::rank
