// lode/inspect.h — explanations across documents and settings:
//  * why_not: where a document ranks for a query and why it is not higher —
//    the query words it lacks after analysis, the required / excluded /
//    phrase / filter clause that removes it, and its score next to the k-th
//    hit's, both broken down term by term;
//  * what_moved: one query under two model settings side by side — the
//    documents that entered, left or moved within the top `depth`, each with
//    the (term, field) contributions that changed.
// Both are built on Searcher::search / explain, so every number is the one
// search would give (docs/inspect.md).
//
// Thread safety: uses the given Searcher and IndexReader (one thread).
#pragma once

#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "lode/ranking.h"

namespace lode {

inline constexpr const char* kWhyNotSchema = "lode.whynot/1";
inline constexpr const char* kMovedSchema = "lode.moved/1";

struct WhyNotOptions {
  std::size_t k = 10;             // the rank to compare with: one page of hits
  std::size_t max_rank = 10000;   // deepest rank looked for; deeper is reported as "below"
};

// One analyzed query word and where the document has it.
struct WordPresence {
  std::string term;
  std::optional<Field> field;  // the clause's field restriction, if any
  bool in_title = false, in_body = false;
  bool in_index = true;        // false: no live document has the word at all
};

struct ClauseVerdict {
  std::string kind;  // "required", "excluded", "phrase", "filter"
  std::string text;  // as typed
  bool holds = true; // false: this clause removes the document
  std::string why;   // one sentence for a reader
};

struct WhyNot {
  Hit doc;                          // its breakdown for the query (empty when it does not match)
  bool matches = false;             // retrieved by the query at all
  std::optional<std::size_t> rank;  // 1-based; nullopt: not retrieved or below max_rank
  std::uint64_t matched = 0;        // documents the query retrieves
  std::vector<WordPresence> words;  // every ranked or required word
  std::vector<std::string> dropped; // words analysis left out (stopwords), from the query's warnings
  std::vector<ClauseVerdict> clauses;
  std::optional<Hit> kth;           // the k-th hit (nullopt when fewer than k match)
};

// REQUIRES: `doc` is a live document of searcher's index. Errors: those of
// Searcher::search and parse_query.
Result<WhyNot> why_not(Searcher& searcher, IndexReader& reader, std::string_view query, DocId doc,
                       const SearchOptions& options, const WhyNotOptions& w = {});
nlohmann::json why_not_json(std::string_view query, const WhyNot& w, const SearchOptions& options,
                            const WhyNotOptions& wo);

struct TermShift {
  std::string term;
  Field field = Field::kBody;
  double before = 0, after = 0;  // contributions under the first and second setting
};
struct MovedDoc {
  Hit before, after;                     // the document's breakdown under each setting
  std::optional<std::size_t> rank_before, rank_after;  // within the top depth, else nullopt
  std::string change;                    // "entered", "left", "up", "down", "same"
  std::vector<TermShift> shifts;         // contributions that differ, largest change first
};
struct Moved {
  std::vector<MovedDoc> docs;  // the second setting's top first, then those that left
  std::size_t entered = 0, left = 0, up = 0, down = 0, same = 0;
};
struct MovedOptions {
  std::size_t depth = 10;  // the ranks compared: one page of hits
  double epsilon = 1e-9;   // contributions closer than this count as unchanged
};
// Runs `query` with `before` and `after` (their top/offset are replaced by depth).
Result<Moved> what_moved(Searcher& searcher, std::string_view query, const SearchOptions& before,
                         const SearchOptions& after, const MovedOptions& o = {});
nlohmann::json moved_json(std::string_view query, const Moved& m, const SearchOptions& before,
                          const SearchOptions& after, const MovedOptions& o);

}  // namespace lode
