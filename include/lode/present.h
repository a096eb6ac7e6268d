// lode/present.h — the JSON shapes lode prints and serves (schema "lode.search/1").
//
// One place builds them so the CLI's --json and the HTTP API agree field for
// field. docs/json-output.md documents every field.
//
// Thread safety: pure functions, except mark_terms, which uses the given
// (single-threaded) Analyzer.
#pragma once

#include <map>
#include <nlohmann/json.hpp>
#include <string_view>
#include <unordered_set>

#include "lode/index.h"
#include "lode/ranking.h"

namespace lode {

inline constexpr const char* kSearchSchema = "lode.search/1";
inline constexpr const char* kStatsSchema = "lode.stats/1";
inline constexpr const char* kBreakdownSchema = "lode.breakdown/1";
inline constexpr const char* kDocumentSchema = "lode.document/1";

// The model and its parameters as used ("name", "k1"/"b" or "weighting", "field_weights").
nlohmann::json model_json(const SearchOptions& options);
nlohmann::json hit_json(const Hit& hit, std::size_t rank, bool with_breakdown);
nlohmann::json results_json(std::string_view query, const SearchResults& results, const SearchOptions& options);
nlohmann::json stats_json(const CollectionStats& stats, const IndexSettings& settings, std::string_view path);

// One document's breakdown for a query: {schema, query, model, matches, hit}
// with `hit` as in hit_json but without "rank".
nlohmann::json breakdown_json(std::string_view query, const Hit& hit, const SearchOptions& options);

// Text of each field read per hit by hit_words(): enough for a page of hits
// to show every term's usual word, little enough to stay fast on long
// documents (a bound, not tuned).
inline constexpr std::size_t kHitWordBytes = 64 * 1024;

// The word each term of the hits' breakdowns stands for: its most frequent
// word in the hits' stored text (first kHitWordBytes of each field), e.g.
// {"damag": "damage"} (lode/surface.h). Empty when the hits carry no
// breakdown. Opens its own read scope on `reader` (REQUIRES: none active).
// Errors: those of IndexReader::stored_text (a hit removed since the search is skipped).
Result<std::map<std::string, std::string>> hit_words(IndexReader& reader, Analyzer& analyzer,
                                                      const std::vector<Hit>& hits);

// The analyzed terms a query ranks or requires; excluded words are left out.
std::unordered_set<std::string> query_terms(const Query& query);

// [begin, end) byte ranges of the words of `text` whose analyzed term is in
// `terms`, in text order. REQUIRES: `text` is valid UTF-8 (stored text is).
std::vector<std::pair<std::uint32_t, std::uint32_t>> mark_terms(std::string_view text, Analyzer& analyzer,
                                                                const std::unordered_set<std::string>& terms);

// Stored text of one field with its marks; `truncated` when cut at a size limit.
struct MarkedText {
  std::string text;
  std::vector<std::pair<std::uint32_t, std::uint32_t>> marks;
  bool truncated = false;
};
// {schema "lode.document/1", doc, title, kind, path, lengths, query,
//  fields: {title: {text, marks, truncated}, body: {...}}}.
nlohmann::json document_json(const DocumentInfo& info, std::string_view query, const MarkedText& title,
                             const MarkedText& body);

}  // namespace lode
