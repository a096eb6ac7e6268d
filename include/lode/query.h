// lode/query.h — query text to a query tree, analyzed like the index.
//
// Syntax (lode's own):
//   wind turbine        bare words: ranked, any may match
//   "tide gauge"        a phrase: the words adjacent and in order (stopword gaps kept);
//                       a document must contain the phrase; its words are also ranked
//   +storm              required: every match contains it
//   -draft              excluded: no match contains it (also -"a phrase")
//   title:lamp          restricts a word or phrase to one field (title, body);
//                       combines with + and -: +title:"fog horn"
// Filters on document metadata (all must hold; not ranked, never analyzed):
//   @kind:pdf           kind is one of a comma list: @kind:pdf,html,email
//   @in:papers/2021     id (path relative to its root) or absolute path starts
//                       with the text; repeat for any of several folders
//   @since:2021-03      document date (or file mtime) on or after the start of
//   @until:2021         that day / month / year (UTC); @until includes the
//                       whole day, month or year given
//   @by:brennan         author contains the text (ASCII case-insensitive)
//   @pages:10-50        page count in range; "10-" and "-50" are open ranges
// An unknown @name: or a bad value is InvalidArgument naming it.
// A bare word that the analyzer splits into several terms ("e-mail") counts as
// separate ranked words; with + or - it counts as a phrase. Stopwords in bare
// words are dropped with a warning.
// Queries that run but probably do not say what was meant get a warning in
// Query::warnings (never an error): an unclosed quote (it runs to the end), a
// word before ':' that is not a field ("author:tulloch", searched as words), a
// @kind: value no reader gives (it matches nothing), and a query whose only
// words are excluded (it matches nothing).
//
// Judged queries and batch files are natural text, not typed syntax (the TREC
// convention): QueryReading::kPlain reads the text as bare ranked words only —
// quotes, +, a leading -, field: and @filter: are no syntax, the analyzer
// sees every character as text. An unbalanced quote then cannot turn the rest
// of a question into a phrase, nor "-dash" exclude a word.
//
// Thread safety: parse_query uses the given Analyzer, which is single-threaded.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "lode/analysis.h"
#include "lode/index.h"
#include "lode/status.h"

namespace lode {

struct QueryLimits {
  std::size_t max_bytes = 16384;  // query text size; longer queries are refused
  std::size_t max_terms = 1024;   // analyzed words over all clauses
};

enum class Occur { kShould, kMust, kMustNot };

struct QueryWord {
  std::string term;       // analyzed (folded, stemmed) term
  std::uint32_t offset;   // position relative to the clause's first word
};

struct Clause {
  Occur occur = Occur::kShould;
  bool phrase = false;              // words must be adjacent with these offsets
  std::optional<Field> field;       // nullopt: title and body
  std::vector<QueryWord> words;     // never empty
  std::string text;                 // the clause as typed, for messages
};

struct Query {
  std::vector<Clause> clauses;
  DocFilter filter;                   // from @name:value items; empty() when none
  std::vector<std::string> warnings;  // e.g. "'the' is a stopword and was left out"
};

// How query text is read: kSyntax, the syntax above (what people type);
// kPlain, every word a bare ranked word (judged queries, batch files).
enum class QueryReading { kSyntax, kPlain };
std::string_view query_reading_name(QueryReading r);  // "syntax", "plain"

// Parses and analyzes `text` (read as `reading` says). Errors: Limit (too long, too many words; the
// message names the limit), InvalidArgument (invalid UTF-8, an unknown
// @filter or a bad filter value). An unknown field before ':' is NOT an
// error: "foo:bar" is searched as words, with a warning.
Result<Query> parse_query(std::string_view text, Analyzer& analyzer, const QueryLimits& limits = {},
                          QueryReading reading = QueryReading::kSyntax);

}  // namespace lode
